import type { PolicyKey } from '@/lib/engine/types';

/** Policy colours, the same everywhere (DESIGN.md). */
export const POLICY_COLOUR: Record<PolicyKey, string> = { keep: '#8c837b', rebuild: '#35618f', repower: '#b0562b' };
export const POLICY_LABEL: Record<PolicyKey, string> = { keep: 'Keep', rebuild: 'Rebuild', repower: 'Repower' };
