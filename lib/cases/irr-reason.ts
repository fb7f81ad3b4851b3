import type { Comparison } from '@/lib/engine/types';

/** Why the engine left an IRR blank (MODEL.md section 8), in a few words; null when there is an IRR. */
export function irrBlankReason(c: Comparison, cashFlowsDelta?: number[]): string | null {
  if (c.irr !== null) return null;
  if (c.irrSignChanges === 0) return 'no investment: Δ cash flow never changes sign';
  const first = cashFlowsDelta?.find((x) => Math.abs(x) > 1e-6);
  if (first !== undefined && first > 0) return 'no investment first: Δ cash flow starts positive';
  if (c.irrSignChanges > 1) return 'several sign changes: more than one rate or none; read MIRR';
  return 'no rate between −99 % and 1,000 %';
}
