import 'server-only';
/**
 * Loads an approved case's plan against actual: its frozen record (case,
 * result, the proposal's policies and swap months, the plan's first month)
 * and the readings of its trucks recorded after the month of its approval,
 * with the last reading before them as the baseline of the first month's hours.
 * Figures come from lib/readings/plan-vs-actual.ts; nothing is re-evaluated.
 */
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { readFrozenRecord } from '@/lib/approvals/canonical';
import { db } from '@/lib/db';
import { notFound } from '@/lib/http';
import { planVsActual, type ActualReading, type PlanVsActual } from './plan-vs-actual';
import { resultAtProposalTimings } from '@/lib/cases/proposal';

export type PlanVsActualView = {
  caseId: number;
  caseName: string;
  approvedMonth: string;
  startMonth: string;
  currency: string;
  tolerancePercent: number;
  fiscalYearStartMonth: number;
  /** the latest reading compared, or null when none is recorded yet */
  latestMonth: string | null;
  figures: PlanVsActual;
};

export async function loadPlanVsActual(access: Access, caseId: number, k: Knex = db()): Promise<PlanVsActualView> {
  const row = await k('business_cases').where({ workspaceId: access.workspace.id, id: caseId }).first('id', 'name', 'status', 'frozenRecord', 'decidedAt');
  if (!row) throw notFound('No such business case in this workspace.');
  const record = row.status === 'approved' ? readFrozenRecord(row.frozenRecord) : null;
  if (!record) throw notFound('This case is not approved (or was approved before its proposal was frozen): plan against actual starts from an approved case.');
  const approvedMonth = String(row.decidedAt ?? '').slice(0, 7);
  const units = record.case.trucks.map((t) => t.id);
  const rows = await k('truck_readings as r')
    .join('trucks as t', 't.id', 'r.truckId')
    .where({ 'r.workspaceId': access.workspace.id })
    .whereIn('t.unitNumber', units)
    .orderBy([{ column: 't.unitNumber' }, { column: 'r.month' }])
    .select('t.unitNumber as unit', 'r.month', 'r.hourMeter', 'r.fuelLitres', 'r.overhauls', 'r.failures', 'r.daysDown', 'r.repowerDate', 'r.repowerCost');
  // after the approval month, plus each truck's last reading up to it as the baseline
  const readings: ActualReading[] = [];
  const baseline = new Map<string, ActualReading>();
  for (const r of rows) {
    const reading: ActualReading = {
      unit: r.unit, month: r.month, hourMeter: Number(r.hourMeter), fuelLitres: Number(r.fuelLitres), overhauls: Number(r.overhauls), failures: Number(r.failures),
      daysDown: Number(r.daysDown), repowerDate: r.repowerDate ?? null, repowerCost: r.repowerCost === null || r.repowerCost === undefined ? null : Number(r.repowerCost),
    };
    if (reading.month <= approvedMonth) baseline.set(reading.unit, reading);
    else readings.push(reading);
  }
  readings.push(...baseline.values());
  const swapMonths: Record<string, number> = {};
  for (const s of record.proposal.schedule as Array<{ truckId?: string; month?: number }>) if (s && typeof s.truckId === 'string' && typeof s.month === 'number') swapMonths[s.truckId] = s.month;
  const startMonth = record.proposal.settings.startMonth;
  const tolerancePercent = access.workspace.settings.actualsTolerancePercent;
  const fiscalYearStartMonth = access.workspace.settings.fiscalYearStartMonth;
  const figures = planVsActual({
    file: record.case, result: resultAtProposalTimings(record.result, record.proposal.timings), policies: record.proposal.policies, startMonth, swapMonths, readings, tolerance: tolerancePercent / 100, fiscalYearStartMonth,
  });
  const latest = figures.fleetMonths.at(-1)?.month ?? null;
  return { caseId: row.id, caseName: row.name, approvedMonth, startMonth, currency: access.workspace.currency, tolerancePercent, fiscalYearStartMonth, latestMonth: latest, figures };
}
