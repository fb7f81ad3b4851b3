import 'server-only';
/**
 * Re-forecast (issue 20): "copy as a new case with actuals". From an approved
 * case, a new draft whose trucks carry the figures their readings give —
 * engine hours, annual operating hours, the measured burn where the case uses
 * one, and the engine type a recorded repower fitted — derived with
 * lib/readings/derive.ts over the same window rule as the register's derived
 * figures (`…/readings/derived?window=N`, rounded as `offerFrom` rounds them).
 * A truck without readings keeps the approved case's figures, and the preview
 * says so. The figures live on the new case (`business_cases.truckFigures`,
 * migration 0018): the register and every other case stay as they are. The
 * new case's plan starts the month after the latest reading.
 */
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { readFrozenCase } from '@/lib/approvals/freeze';
import { writeAudit } from '@/lib/audit';
import { insertReturningId } from '@/lib/api/crud';
import { conflict, invalid, notFound } from '@/lib/http';
import { deriveFigures, monthMinus, monthsBetween, type DerivedFigures } from '@/lib/readings/derive';
import { nowIso } from '@/lib/time';
import { readPlanSettings, truckFiguresSchema, type PlanSettings, type TruckFigures } from '@/lib/validation/business-case';
import { offerFrom } from './readings';

export type ReforecastField = 'engineHours' | 'annualHours' | 'fuelBurnLitresPerHour' | 'engine';
type Figures = { engineHours: number; annualHours: number; fuelBurnLitresPerHour: number | null; engineKey: string };

export type ReforecastTruck = {
  truckId: number | null;
  unitNumber: string;
  /** readings recorded for the truck (all months) */
  readings: number;
  /** the figures in the approved case (its frozen case file) */
  case: Figures;
  /** what the readings give, with their date and window; null without readings */
  fromReadings: (Partial<Figures> & { asOf: string; window: DerivedFigures['window']; engineHoursBasis: DerivedFigures['engineHours']; repower: DerivedFigures['repower'] }) | null;
  /** the figures the new draft will hold */
  next: Figures;
  /** which figures differ from the approved case */
  changes: ReforecastField[];
  /** why a truck keeps the case's figures, or what to mind */
  note: string;
};

export type ReforecastPreview = {
  caseId: number;
  caseName: string;
  windowMonths: number;
  /** the latest reading of any of the case's trucks, or null when none has readings */
  lastReading: string | null;
  planStartMonth: { current: string; next: string | null };
  trucks: ReforecastTruck[];
  /** trucks with readings / without */
  withReadings: number;
  withoutReadings: number;
};

type Loaded = ReforecastPreview & { row: Record<string, unknown>; plan: PlanSettings; truckFigures: TruckFigures };

const NOT_APPROVED = (status: string) =>
  conflict(`This case is ${status}; only an approved case can be re-forecast from its readings. Copy it instead to work on it.`);

/** Everything the preview shows and the POST writes, read with `k` (the POST's transaction). */
async function loadReforecast(k: Knex, access: Access, caseId: number, windowMonths: number): Promise<Loaded> {
  const wsId = access.workspace.id;
  const row = await k('business_cases').where({ workspaceId: wsId, id: caseId }).first();
  if (!row) throw notFound('No such business case in this workspace.');
  if (row.status !== 'approved') throw NOT_APPROVED(row.status);
  const file = readFrozenCase(row);
  if (!file) throw NOT_APPROVED('approved without a frozen record');
  const plan = readPlanSettings(row.plan, row.createdAt);

  const units = file.trucks.map((t) => t.id);
  const [trucks, engines] = await Promise.all([
    k('trucks').where({ workspaceId: wsId }).whereIn('unitNumber', units).select('id', 'unitNumber'),
    k('engine_types').where({ workspaceId: wsId }).select('id', 'key'),
  ]);
  const truckId = new Map<string, number>(trucks.map((t) => [t.unitNumber as string, t.id as number]));
  const readings = await k('truck_readings')
    .where({ workspaceId: wsId })
    .whereIn('truckId', [...truckId.values()])
    .select('truckId', 'month', 'hourMeter', 'fuelLitres', 'overhauls', 'repowerDate', 'repowerEngineTypeId');
  const byTruck = new Map<number, Array<(typeof readings)[number]>>();
  for (const r of readings) (byTruck.get(r.truckId) ?? byTruck.set(r.truckId, []).get(r.truckId)!).push({ ...r, hourMeter: Number(r.hourMeter), fuelLitres: Number(r.fuelLitres), overhauls: Number(r.overhauls) });
  const engineKey = new Map<number, string>(engines.map((e) => [e.id as number, e.key as string]));
  const engineId = new Map<string, number>(engines.map((e) => [e.key as string, e.id as number]));

  const out: ReforecastTruck[] = [];
  const truckFigures: TruckFigures = {};
  let lastReading: string | null = null;
  for (const t of file.trucks) {
    const id = truckId.get(t.id) ?? null;
    const own = id === null ? [] : byTruck.get(id) ?? [];
    const caseFigures: Figures = { engineHours: t.engineHours, annualHours: t.annualHours, fuelBurnLitresPerHour: t.fuelBurnLitresPerHour ?? null, engineKey: t.engineId };
    const derived = deriveFigures(own, windowMonths);
    let fromReadings: ReforecastTruck['fromReadings'] = null;
    let next = caseFigures;
    let note = '';
    if (id === null) note = 'No longer in the fleet register: kept as the case had it (the new case will ask for it to be removed).';
    else if (!derived) note = 'No readings: kept as the case had it.';
    if (derived) {
      if (lastReading === null || derived.asOf > lastReading) lastReading = derived.asOf;
      const offer = offerFrom(derived);
      const readingEngine = offer.engineTypeId !== undefined ? engineKey.get(offer.engineTypeId) : undefined;
      fromReadings = {
        asOf: derived.asOf, window: derived.window, engineHoursBasis: derived.engineHours, repower: derived.repower,
        engineHours: offer.engineHours, annualHours: offer.annualHours, fuelBurnLitresPerHour: offer.fuelBurnLitresPerHour, engineKey: readingEngine,
      };
      next = {
        engineHours: offer.engineHours ?? caseFigures.engineHours,
        annualHours: offer.annualHours ?? caseFigures.annualHours,
        // the measured burn replaces the case's only where the case uses one (else the engine's BSFC stands)
        fuelBurnLitresPerHour: caseFigures.fuelBurnLitresPerHour !== null && offer.fuelBurnLitresPerHour !== undefined ? offer.fuelBurnLitresPerHour : caseFigures.fuelBurnLitresPerHour,
        engineKey: readingEngine ?? caseFigures.engineKey,
      };
      const notes: string[] = [];
      if (offer.annualHours === undefined) notes.push('one reading only: annual hours and burn kept as the case had them');
      if (derived.repower) notes.push(`repowered on ${derived.repower.date}${readingEngine ? ` (${readingEngine} fitted)` : ' (engine fitted not recorded: engine type kept)'}`);
      note = notes.length ? `${notes.join('; ')}.` : '';
    }
    const changes: ReforecastField[] = [];
    if (next.engineHours !== caseFigures.engineHours) changes.push('engineHours');
    if (next.annualHours !== caseFigures.annualHours) changes.push('annualHours');
    if (next.fuelBurnLitresPerHour !== caseFigures.fuelBurnLitresPerHour) changes.push('fuelBurnLitresPerHour');
    if (next.engineKey !== caseFigures.engineKey) changes.push('engine');
    if (id !== null) {
      const nextEngine = engineId.get(next.engineKey);
      truckFigures[String(id)] = {
        engineHours: next.engineHours,
        annualHours: next.annualHours,
        ...(next.fuelBurnLitresPerHour !== null ? { fuelBurnLitresPerHour: next.fuelBurnLitresPerHour } : {}),
        ...(nextEngine !== undefined ? { engineTypeId: nextEngine } : {}),
      };
    }
    out.push({ truckId: id, unitNumber: t.id, readings: own.length, case: caseFigures, fromReadings, next, changes, note });
  }
  const withReadings = out.filter((t) => t.fromReadings).length;
  return {
    caseId: row.id,
    caseName: row.name,
    windowMonths,
    lastReading,
    planStartMonth: { current: plan.startMonth, next: lastReading === null ? null : monthMinus(lastReading, -1) },
    trucks: out,
    withReadings,
    withoutReadings: out.length - withReadings,
    row,
    plan,
    truckFigures,
  };
}

/** GET: the preview (any member may read it). 409 for a case that is not approved. */
export async function previewReforecast(k: Knex, access: Access, caseId: number, windowMonths: number): Promise<ReforecastPreview> {
  const { row: _row, plan: _plan, truckFigures: _figures, ...preview } = await loadReforecast(k, access, caseId, windowMonths);
  return preview;
}

/** The default name: the approved case's, with the month of the readings. */
export const reforecastName = (name: string, lastReading: string) => `${name.replace(/ — re-forecast \d{4}-\d{2}$/, '')} — re-forecast ${lastReading}`.slice(0, 200);

/**
 * The plan moved to its new month 0: the shop's month overrides keep their
 * calendar months (months before the new start drop out); budgets and the
 * other settings stay as they were.
 */
export function movePlan(plan: PlanSettings, startMonth: string): PlanSettings {
  const shift = monthsBetween(plan.startMonth, startMonth);
  const capacityByMonth: Record<string, number> = {};
  for (const [m, n] of Object.entries(plan.capacityByMonth ?? {})) {
    const at = Number(m) - shift;
    if (at >= 0 && at <= 239) capacityByMonth[String(at)] = n;
  }
  return { ...plan, startMonth, capacityByMonth };
}

/**
 * POST: the new draft, in one transaction with its audit row (`reforecast`).
 * 409 when the case is not approved or none of its trucks has readings; 422
 * when a derived figure falls outside the case file's ranges (naming the truck).
 */
export async function createReforecast(
  trx: Knex.Transaction,
  access: Access,
  caseId: number,
  input: { windowMonths: number; name?: string },
): Promise<{ id: number; name: string; preview: ReforecastPreview }> {
  const loaded = await loadReforecast(trx, access, caseId, input.windowMonths);
  const { row, plan, truckFigures, ...preview } = loaded;
  if (preview.lastReading === null) throw conflict('None of this case\'s trucks has readings yet: there is nothing to re-forecast from. Copy the case instead.');
  const checked = truckFiguresSchema.safeParse(truckFigures);
  if (!checked.success) {
    throw invalid(checked.error.issues.map((i) => {
      const unit = preview.trucks.find((t) => String(t.truckId) === String(i.path[0]))?.unitNumber ?? String(i.path[0]);
      return { path: `trucks.${unit}.${String(i.path[1] ?? '')}`, message: `the figure from readings ${i.message}` };
    }), 'A figure from readings is outside what a case accepts.');
  }
  const name = input.name ?? reforecastName(String(row.name), preview.lastReading);
  const nextPlan = movePlan(plan, preview.planStartMonth.next!);
  const now = nowIso();
  const values = {
    workspaceId: access.workspace.id,
    name,
    assumptionSetId: row.assumptionSetId,
    selection: row.selection,
    plan: JSON.stringify(nextPlan),
    truckFigures: JSON.stringify(checked.data),
    // the engine lives the approved case adopted stay adopted
    engineLives: row.engineLives ?? null,
    status: 'draft',
    version: 1,
    createdBy: access.userId,
    updatedBy: access.userId,
    createdAt: now,
    updatedAt: now,
  };
  const id = await insertReturningId(trx, 'business_cases', values);
  await writeAudit(trx, {
    workspaceId: access.workspace.id,
    userId: access.userId,
    action: 'reforecast',
    entity: 'business_case',
    entityId: id,
    before: { reforecastOf: caseId, windowMonths: input.windowMonths, readingsTo: preview.lastReading },
    after: {
      name, assumptionSetId: row.assumptionSetId, selection: JSON.parse(String(row.selection)), plan: nextPlan, status: 'draft', version: 1,
      truckFigures: Object.fromEntries(preview.trucks.filter((t) => t.truckId !== null).map((t) => [t.unitNumber, { ...t.next, source: t.fromReadings ? `readings to ${t.fromReadings.asOf}` : 'kept (no readings)' }])),
    },
  });
  return { id, name, preview };
}

/** A case's own truck figures (a re-forecast case's) with unit numbers and engine keys, for its page; [] when it has none. */
export async function listOwnTruckFigures(k: Knex, workspaceId: number, figures: TruckFigures) {
  const ids = Object.keys(figures).map(Number);
  if (ids.length === 0) return [];
  const [trucks, engines] = await Promise.all([
    k('trucks').where({ workspaceId }).whereIn('id', ids).select('id', 'unitNumber'),
    k('engine_types').where({ workspaceId }).select('id', 'key'),
  ]);
  const engineKey = new Map<number, string>(engines.map((e) => [e.id as number, e.key as string]));
  return trucks
    .map((t) => {
      const f = figures[String(t.id)];
      return {
        truckId: t.id as number, unitNumber: t.unitNumber as string, engineHours: f.engineHours ?? null, annualHours: f.annualHours ?? null,
        fuelBurnLitresPerHour: f.fuelBurnLitresPerHour ?? null, engineKey: f.engineTypeId !== undefined ? engineKey.get(f.engineTypeId) ?? null : null,
      };
    })
    .sort((a, b) => (a.unitNumber < b.unitNumber ? -1 : a.unitNumber > b.unitNumber ? 1 : 0));
}
