import 'server-only';
/**
 * Evaluating a stored business case on the server: build the case/1 from the
 * workspace's data, validate it with the engine's own validation (a case
 * that fails answers 422 with every problem, e.g. a truck without an offer),
 * evaluate it, then rank, plan and schedule.
 */
import type { Access } from '@/lib/auth/access';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { fetchCase, type CaseRow } from '@/lib/db/queries/cases';
import { db } from '@/lib/db';
import { evaluateCaseDetailed, evaluateTruck, validateCase, type CaseFile } from '@/lib/engine';
import { invalid, notFound, type Problem } from '@/lib/http';
import { buildDecisionSummary } from './decision-summary';
import { fleetByYear } from './fleet-years';
import { programmeOf } from './programme';
import { proposalFromProgramme } from './proposal';
import { dueSwapsOf } from '@/lib/plan/settings-input';
import { summariseFleet, timelines } from './summary';
import { deltaNpvWithoutGain } from './without-gain';
import { cachedEvaluation } from './result-cache';
import type { CaseSummaryDto, EvaluatedCase, TruckMeta, TruckResultDto } from './types';

export function toSummaryDto(c: CaseRow): CaseSummaryDto {
  return {
    id: c.id,
    name: c.name,
    status: c.status,
    version: c.version,
    assumptionSetId: c.assumptionSetId,
    assumptionSetName: c.assumptionSetName,
    truckCount: c.selection.length,
    plan: c.plan,
    engineLives: c.engineLives,
    updatedAt: c.updatedAt,
  };
}

type BuiltCaseFile = Awaited<ReturnType<typeof buildCaseFile>>;
type TruckRows = Map<string, { id: number; payloadClass: string }>;
type Loaded = { row: CaseRow; file: CaseFile; truckRows: TruckRows };

/**
 * What a stored case evaluates from, read from the database and not yet
 * validated: the frozen or submitted snapshot (already valid when stored), or
 * the live case file built from the register. `problems` are the ones found
 * before the file could be built (a deleted assumption set or truck).
 */
export type CaseInputs = {
  row: CaseRow;
  /** the stored snapshot (valid when stored) or the live file as built, not yet validated; null when `problems` stopped the build */
  file: CaseFile | BuiltCaseFile | null;
  truckRows: TruckRows;
  source: 'frozen' | 'submitted' | 'live';
  problems: Problem[];
};

export async function loadCaseInputs(access: Access, id: number): Promise<CaseInputs> {
  const wsId = access.workspace.id;
  const row = await fetchCase(wsId, id);
  if (!row) throw notFound('No such business case in this workspace.');
  // An approved case is its frozen record, a case awaiting decision the snapshot
  // taken at submission: later edits to the fleet reach neither.
  const stored = row.frozenCase ?? (row.status === 'submitted' ? row.submittedCase : null);
  if (stored) {
    const file = JSON.parse(stored) as CaseFile;
    const units = file.trucks.map((t) => t.id);
    const rows = await db()('trucks').where({ workspaceId: wsId }).whereIn('unitNumber', units).select('id', 'unitNumber', 'payloadClass');
    const source = row.frozenCase ? 'frozen' : 'submitted';
    return { row, file, source, problems: [], truckRows: new Map(rows.map((t) => [t.unitNumber as string, { id: t.id, payloadClass: t.payloadClass }])) };
  }
  const problems: Problem[] = [];
  if (row.assumptionSetId === null) problems.push({ path: 'assumptionSetId', message: 'the assumption set was deleted; choose another' });
  const ids = row.selection.map((s) => s.truckId);
  const found = await db()('trucks').where({ workspaceId: wsId }).whereIn('id', ids).select('id', 'unitNumber', 'payloadClass');
  const present = new Set(found.map((t) => t.id));
  row.selection.forEach((s, i) => {
    if (!present.has(s.truckId)) problems.push({ path: `selection[${i}]`, message: 'this truck has been removed from the fleet register' });
  });
  const truckRows: TruckRows = new Map(found.map((t) => [t.unitNumber as string, { id: t.id, payloadClass: t.payloadClass }]));
  if (problems.length) return { row, file: null, source: 'live', problems, truckRows };
  const offerOverrides = Object.fromEntries(row.selection.map((s) => [s.truckId, s.repowerOfferId]));
  const built = await buildCaseFile(wsId, { name: row.name, assumptionSetId: row.assumptionSetId as number, truckIds: ids, offerOverrides, truckFigures: row.truckFigures, engineLives: row.engineLives });
  return { row, file: built, source: 'live', problems, truckRows };
}

/** The loaded inputs as a valid case file, or 422 with every problem (each truck named beside its index). */
export function validateInputs(inputs: CaseInputs): Loaded {
  const { row, truckRows } = inputs;
  if (inputs.problems.length || !inputs.file) throw invalid(inputs.problems, 'This case cannot be evaluated.');
  if (inputs.source !== 'live') return { row, file: inputs.file as CaseFile, truckRows };
  const built = inputs.file;
  const v = validateCase(built);
  if (!v.ok) {
    // name the truck beside its index so a planner can find it in the register
    const named = v.problems.map((p) => {
      const m = /^trucks\[(\d+)\]/.exec(p.path);
      const unit = m ? built.trucks[Number(m[1])]?.id : undefined;
      const what = p.path.endsWith('repowerOfferId') && p.message.match(/required/i) ? 'has no repower offer; give it one in the register or pick one in the case' : p.message;
      return unit ? { path: `${p.path} (truck ${unit})`, message: what } : p;
    });
    throw invalid(named, 'This case cannot be evaluated.');
  }
  return { row, file: v.value, truckRows };
}

export async function loadValidCase(access: Access, id: number): Promise<Loaded> {
  return validateInputs(await loadCaseInputs(access, id));
}

function metaFor(file: CaseFile, truckRows: Loaded['truckRows'], truckId: string, events: TruckMeta['events']): TruckMeta {
  const t = file.trucks.find((x) => x.id === truckId)!;
  const r = truckRows.get(truckId);
  return { rowId: r?.id ?? 0, payloadClass: r?.payloadClass ?? '', engineId: t.engineId, repowerOfferId: t.repowerOfferId, engineHours: t.engineHours, annualHours: t.annualHours, events };
}

/**
 * The stored case evaluated in full. Evaluations are cached by everything they
 * read (lib/cases/result-cache.ts), so a second read of an unchanged case
 * costs the database reads alone; callers must not modify the answer.
 */
export async function evaluateStoredCase(access: Access, id: number): Promise<EvaluatedCase> {
  return (await cachedEvaluation(access, id)).evaluated;
}

/** The evaluation behind a cache miss: validate the loaded inputs, evaluate, plan and summarise. */
export async function evaluateInputs(access: Access, inputs: CaseInputs): Promise<EvaluatedCase> {
  const started = performance.now();
  const { row, file, truckRows } = validateInputs(inputs);
  const { result, details } = evaluateCaseDetailed(file, { trusted: true });
  const trucks: Record<string, TruckMeta> = {};
  for (const d of details) {
    const annual = file.trucks.find((t) => t.id === d.truckId)!.annualHours;
    trucks[d.truckId] = metaFor(file, truckRows, d.truckId, timelines(d, annual));
  }
  // the proposal is the fleet programme's answer under the saved budgets and shop capacity
  const programme = await programmeOf(file, row.plan);
  const built = proposalFromProgramme(result, programme, row.plan);
  const { ranking, plan, schedule } = built;
  const fiscalYearStartMonth = access.workspace.settings.fiscalYearStartMonth;
  const source = inputs.source;
  const proposal = buildDecisionSummary({
    caseId: row.id,
    caseName: row.name,
    status: row.status,
    source,
    currency: access.workspace.currency,
    fiscalYearStartMonth,
    planStartMonth: row.plan.startMonth,
    file,
    result,
    plan,
    policies: built.policies,
    timings: built.timings,
    timingSpecs: built.timingSpecs,
    drivers: [],
    risk: null,
  });
  return {
    case: toSummaryDto(row),
    valuation: file.assumptions.valuation,
    withoutGain: deltaNpvWithoutGain(file),
    currency: access.workspace.currency,
    negativeStyle: access.workspace.settings.negativeStyle,
    result,
    trucks,
    summary: summariseFleet(result),
    ranking,
    plan,
    schedule,
    dueSwaps: dueSwapsOf(programme.options),
    proposal,
    fiscalYearStartMonth,
    discountFactors: Object.fromEntries(details.map((d) => [d.truckId, d.policies.repower.periods.map((p) => p.discountFactor)])),
    fleetYears: fleetByYear(result, details, Object.fromEntries(file.trucks.map((t) => [t.id, t.annualHours]))),
    evaluatedMs: Math.round(performance.now() - started),
  };
}

export async function evaluateStoredTruck(access: Access, id: number, truckId: string): Promise<TruckResultDto> {
  const { row, file, truckRows } = await loadValidCase(access, id);
  if (!file.trucks.some((t) => t.id === truckId)) throw notFound('No such truck in this case.');
  const { result, detail } = evaluateTruck(file, truckId, { trusted: true });
  const annual = file.trucks.find((t) => t.id === truckId)!.annualHours;
  return {
    case: toSummaryDto(row),
    valuation: file.assumptions.valuation,
    withoutGain: deltaNpvWithoutGain(file, [truckId]),
    currency: access.workspace.currency,
    negativeStyle: access.workspace.settings.negativeStyle,
    result,
    detail,
    meta: metaFor(file, truckRows, truckId, timelines(detail, annual)),
  };
}
