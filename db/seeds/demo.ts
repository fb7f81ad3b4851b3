import fs from 'node:fs';
import path from 'node:path';
import type { Knex } from 'knex';
import { hashPassword } from '../../lib/auth/password';
import { nowIso } from '../../lib/time';
import { assumptionSetColumns } from '../../lib/db/assumption-columns';
import type { FrozenRecord } from '../../lib/approvals/canonical';
import { freezeCase, snapshotForSubmission, type CaseRow as FreezeRow } from '../../lib/approvals/freeze';
import type { PolicyKey } from '../../lib/engine/types';
import { monthOfIndex, yearForecast } from '../../lib/readings/plan-vs-actual';
import { resultAtProposalTimings } from '../../lib/cases/proposal';

/** The demo password of every demo account (listed in the README). */
export const DEMO_PASSWORD = 'haulcase-demo';
export const DEMO_WORKSPACE = 'aldervane-north-pit';
export const OTHER_WORKSPACE = 'corrin-flats';

const scenariosDir = path.join(__dirname, '..', '..', 'scenarios');
const readJson = (name: string) => JSON.parse(fs.readFileSync(path.join(scenariosDir, name), 'utf8'));

type DemoCase = {
  assumptions: Record<string, unknown>;
  engines: Array<Record<string, number | string> & { id: string }>;
  repowerOffers: Array<Record<string, number | string> & { id: string; engineId: string }>;
  trucks: Array<Record<string, number | string | null> & { id: string; engineId: string; repowerOfferId: string }>;
};

const ENGINE_NAMES: Record<string, string> = {
  'ac-2600-legacy': 'In-service 2,600 kW (300 t class)',
  'ac-1900-legacy': 'In-service 1,900 kW (230 t class)',
  'km-2700-bypass': 'Module 2,700 kW, bypass oil filtration',
  'bd-2000-bypass': 'Module 2,000 kW, bypass oil filtration',
};
const SUPPLIERS: Record<string, string> = {
  'kestrel-km2700': 'Kestrel Powerworks (invented)',
  'brannock-bd2000': 'Brannock Drive Systems (invented)',
};

/**
 * The second demo site, "Corrin Flats Iron" (invented, AUD): a small fleet of
 * its own so that a consultant who serves both sites switches between two real
 * workspaces. 180 t class trucks on one in-service engine type, one repower
 * offer, one assumption set, one draft case over the whole fleet. Every figure
 * is invented for the demo; the Weibull figures follow the same reasoning as
 * the first site's (β ≈ 3, "from memory": wear-out failures of large diesels;
 * η giving about 15 % in-service failures before the planned life, "common
 * practice": a planned life near the B10–B20 life).
 */
const CORRIN = {
  engines: [
    {
      key: 'cf-1600-inservice', name: 'In-service 1,600 kW (180 t class)', ratedKw: 1600, bsfcGPerKwh: 214, lifeHours: 17000,
      weibullShape: 3.0, weibullScaleHours: 31000, overhaulCost: 610000, overhaulDowntimeDays: 8, failureCost: 930000, failureDowntimeDays: 24,
      serviceIntervalHours: 250, sumpLitres: 190, serviceKitCost: 640, serviceLabourHours: 4, topUpLitresPerHour: 0.1,
    },
    {
      key: 'cf-1700-module', name: 'Module 1,700 kW, extended service interval', ratedKw: 1700, bsfcGPerKwh: 201, lifeHours: 22000,
      weibullShape: 3.2, weibullScaleHours: 42000, overhaulCost: 650000, overhaulDowntimeDays: 7, failureCost: 960000, failureDowntimeDays: 22,
      serviceIntervalHours: 500, sumpLitres: 190, serviceKitCost: 820, serviceLabourHours: 4.5, topUpLitresPerHour: 0.06,
    },
  ],
  offer: {
    key: 'wyndell-cf1700', supplier: 'Wyndell Engine Works (invented)', engineKey: 'cf-1700-module', modulePrice: 1_480_000, installCost: 115_000,
    coreCredit: 80_000, failedCoreCredit: 45_000, downtimeDays: 2, productivityGain: 0.008, timing: 'at-overhaul',
  },
  // unit, engine hours, remaining life (h), annual hours, load factor, t/h, measured fuel burn (L/h, null = from BSFC)
  trucks: [
    ['CF-101', 14200, 2800, 5900, 0.52, 520, 206.5],
    ['CF-102', 9800, 7200, 6000, 0.5, 505, null],
    ['CF-103', 16100, 900, 5800, 0.55, 535, 213.8],
    ['CF-104', 4200, 12800, 6100, 0.49, 498, null],
    ['CF-105', 12600, 4400, 5700, 0.51, 512, 201.2],
    ['CF-106', 7300, 9700, 6050, 0.53, 526, null],
    ['CF-107', 15400, 1600, 5850, 0.54, 530, 210.9],
  ] as Array<[string, number, number, number, number, number, number | null]>,
  assumptions: {
    discountRate: 0.09, timing: 'end-of-year', horizonYears: null, inflation: 0.03, fuelPrice: 1.62, fuelEscalation: 0.03,
    fuelDensityKgPerL: 0.835, co2KgPerLitre: 2.697, lubePrice: 6.1, labourRate: 145, carbonPrice: 0, carbonEscalation: 0,
    marginPerTonne: 3.1, taxRate: 0.3, depreciation: { method: 'straight-line', years: 8 }, rebuildAccounting: 'expense',
    valuation: 'expected', lostMarginShare: 1,
  } as Record<string, unknown>,
};

async function seedSecondSite(trx: Knex.Transaction, ws: number, userId: number, consultantId: number, now: string) {
  const audit = { version: 1, createdBy: userId, updatedBy: userId, createdAt: now, updatedAt: now };
  const engineIds: Record<string, number> = {};
  for (const e of CORRIN.engines) engineIds[e.key] = await insertId(trx, 'engine_types', { workspaceId: ws, ...e, ...audit });
  const { engineKey, ...offer } = CORRIN.offer;
  const offerId = await insertId(trx, 'repower_offers', { workspaceId: ws, ...offer, engineTypeId: engineIds[engineKey], ...audit });
  const truckIds: number[] = [];
  for (const [unitNumber, engineHours, remainingLifeHours, annualHours, loadFactor, tonnesPerHour, fuelBurnLitresPerHour] of CORRIN.trucks) {
    truckIds.push(await insertId(trx, 'trucks', {
      workspaceId: ws, unitNumber, payloadClass: '180 t', engineTypeId: engineIds['cf-1600-inservice'], repowerOfferId: offerId,
      engineHours, remainingLifeHours, annualHours, loadFactor, tonnesPerHour, fuelBurnLitresPerHour, ...audit,
    }));
  }
  const setId = await insertId(trx, 'assumption_sets', { workspaceId: ws, name: 'Base', ...assumptionSetColumns(CORRIN.assumptions), notes: 'Invented demo figures, AUD.', ...audit });
  await trx('business_cases').insert({
    workspaceId: ws,
    name: 'Corrin Flats haul fleet — base',
    assumptionSetId: setId,
    selection: JSON.stringify(truckIds.map((truckId) => ({ truckId, repowerOfferId: null }))),
    plan: '{}',
    status: 'draft',
    version: 1,
    // the consultant (the first site's analyst, a member of both) builds the case
    createdBy: consultantId,
    updatedBy: consultantId,
    createdAt: now,
    updatedAt: now,
  });
  await trx('audit_log').insert({ workspaceId: ws, userId: null, action: 'seed', entity: 'workspace', entityId: String(ws), before: null, after: JSON.stringify({ slug: OTHER_WORKSPACE }), at: now });
}

async function createUser(knex: Knex, email: string, name: string, passwordHash: string): Promise<number> {
  const now = nowIso();
  const [row] = await knex('users').insert({ email, name, passwordHash, createdAt: now, updatedAt: now }).returning('id');
  return typeof row === 'object' ? row.id : row;
}

async function insertId(knex: Knex, table: string, values: Record<string, unknown>): Promise<number> {
  const [row] = await knex(table).insert(values).returning('id');
  return typeof row === 'object' ? row.id : row;
}

/**
 * The approved demo case (issue 20): "North Pit 300 t repower programme", the
 * 300 t trucks but T3-01, submitted and approved in 2024-11 through the app's
 * own snapshot and freeze (lib/approvals/freeze.ts), so its frozen record is
 * real; its plan starts in 2024-12.
 */
const APPROVED_PLAN = { budgets: { '0': 3_000_000, '1': 8_000_000, '2': 6_000_000 }, swapsPerMonth: 2, startMonth: '2024-12' };
const APPROVED_AT = { submitted: '2024-11-12T09:30:00.000Z', approved: '2024-11-20T15:10:00.000Z' };
/** Months of readings after the approval (2024-12 … 2026-11), after a baseline reading in 2024-11. */
const READING_MONTHS = 24;
/** T3-14's repower, planned by the programme in the plan's month 0 (2024-12), was done seven months late (2025-07). */
const LATE_REPOWER = { unit: 'T3-14', monthsLate: 7 };
/** T3-05 burns about 8 % more than the approved case forecast. */
const OVER_BURN = { unit: 'T3-05', factor: 1.08 };

/**
 * Invented monthly readings for the approved case's trucks from the frozen
 * forecast: each month runs the case's hours for that year / 12 and burns the
 * proposal's expected litres an hour, both varied a little month to month
 * (deterministic: sines of the month), T3-05 8 % over; the scheduled swaps in
 * the two years are done in their month (T3-14 seven months late) at the offer's
 * price; T3-02 had an overhaul in 2025-01 and T3-07 an in-service failure in
 * 2025-06. Every figure is invented.
 */
function demoReadingRows(
  ws: number, record: FrozenRecord, truckIds: Record<string, number>, engineIds: Record<string, number>, audit: Record<string, unknown>,
) {
  const rows: Record<string, unknown>[] = [];
  const swapMonth = new Map((record.proposal.schedule as Array<{ truckId: string; month: number }>).map((x) => [x.truckId, x.month]));
  const file = record.case;
  // each truck as the proposal times it (a repowered truck's chosen timing stands for its repower)
  resultAtProposalTimings(record.result, record.proposal.timings).trucks.forEach((truck, k) => {
    const t = file.trucks.find((x) => x.id === truck.id)!;
    const offer = file.repowerOffers.find((o) => o.id === t.repowerOfferId)!;
    const policy = (record.proposal.policies[truck.id] ?? 'rebuild') as PolicyKey;
    const planned = swapMonth.get(truck.id);
    const doneAt = planned === undefined || policy !== 'repower' ? null : planned + (truck.id === LATE_REPOWER.unit ? LATE_REPOWER.monthsLate : 0);
    let meter = t.engineHours;
    const row = (month: string, extra: Record<string, unknown>) => ({
      workspaceId: ws, truckId: truckIds[truck.id], month, tonnes: null, overhauls: 0, failures: 0, daysDown: 0,
      repowerDate: null, repowerCost: null, repowerEngineTypeId: null, notes: '', ...extra, ...audit,
    });
    rows.push(row(monthOfIndex(APPROVED_PLAN.startMonth, -1), { hourMeter: Math.round(meter), fuelLitres: Math.round((t.annualHours / 12) * truck.options[policy].fuelLitresPerHour) }));
    for (let m = 0; m < READING_MONTHS; m++) {
      const y = Math.floor(m / 12) + 1;
      const f = yearForecast(file, truck, policy, y);
      const hours = Math.round((f.hours / 12) * (1 + 0.03 * Math.sin(1.3 * m + k)));
      const repowered = doneAt === m;
      meter = repowered ? hours : meter + hours;
      const factor = (truck.id === OVER_BURN.unit ? OVER_BURN.factor : 1) * (1 + 0.01 * Math.sin(0.7 * m + 2 * k));
      const month = monthOfIndex(APPROVED_PLAN.startMonth, m);
      const overhaul = truck.id === 'T3-02' && month === '2025-01';
      const failure = truck.id === 'T3-07' && month === '2025-06';
      const price = (offer.modulePrice + offer.installCost - offer.coreCredit) * Math.pow(1 + file.assumptions.inflation, Math.max(0, y - 1));
      rows.push(row(month, {
        hourMeter: Math.round(meter), fuelLitres: Math.round(f.burn * hours * factor), tonnes: Math.round(hours * t.tonnesPerHour),
        overhauls: overhaul ? 1 : 0, failures: failure ? 1 : 0, daysDown: overhaul ? 9 : failure ? 21 : repowered ? 3 : 0,
        repowerDate: repowered ? `${month}-14` : null, repowerCost: repowered ? Math.round(price) : null, repowerEngineTypeId: repowered ? engineIds[offer.engineId] : null,
      }));
    }
  });
  return rows;
}

/** Submits and approves the demo's approved case through the app's snapshot and freeze; returns its frozen record. */
async function seedApprovedCase(trx: Knex.Transaction, ws: number, users: Record<string, number>, assumptionSetId: number, truckIds: Record<string, number>): Promise<FrozenRecord> {
  const units = Object.keys(truckIds).filter((u) => u.startsWith('T3') && u !== 'T3-01').sort();
  const values = {
    workspaceId: ws, name: 'North Pit 300 t repower programme (approved 2024-11)', assumptionSetId,
    selection: JSON.stringify(units.map((u) => ({ truckId: truckIds[u], repowerOfferId: null }))), plan: JSON.stringify(APPROVED_PLAN),
    status: 'submitted', version: 1, createdBy: users.analyst, updatedBy: users.analyst, createdAt: APPROVED_AT.submitted, updatedAt: APPROVED_AT.submitted,
  };
  const id = await insertId(trx, 'business_cases', values);
  const row: FreezeRow = { ...values, id, frozenCase: null, frozenResult: null, frozenHash: null, frozenRecord: null, submittedCase: null };
  const submittedCase = await snapshotForSubmission(trx, row);
  await trx('case_events').insert({ workspaceId: ws, caseId: id, userId: users.analyst, action: 'submit', comment: 'Repower programme for the 300 t fleet.', at: APPROVED_AT.submitted });
  const frozen = await freezeCase(trx, { ...row, submittedCase }, { currency: 'USD', fiscalYearStartMonth: 1 });
  await trx('business_cases').where({ id }).update({
    submittedCase, submittedBy: users.analyst, submittedAt: APPROVED_AT.submitted, status: 'approved', decidedAt: APPROVED_AT.approved, ...frozen,
    version: 3, updatedBy: users.approver, updatedAt: APPROVED_AT.approved,
  });
  await trx('case_events').insert({ workspaceId: ws, caseId: id, userId: users.approver, action: 'approve', comment: 'Approved within the three-year budget.', at: APPROVED_AT.approved });
  return JSON.parse(frozen.frozenRecord) as FrozenRecord;
}

/**
 * Seeds the invented demo mine "Aldervane Copper — North Pit" (fleet from
 * scenarios/aldervane-north-pit.json, assumption sets from
 * scenarios/aldervane-assumption-sets.json), a draft business case over the
 * whole fleet, an approved case with two years of readings after its approval
 * (seedApprovedCase, demoReadingRows), one user per role, and a second
 * small workspace with a fleet of its own ("Corrin Flats Iron", see CORRIN)
 * so that workspace separation can be seen and tested.
 * Does nothing when the demo workspace already exists.
 *
 * The demo engines' Weibull figures (scenarios/aldervane-north-pit.json) are
 * invented, chosen so that most engines reach their planned overhaul, as a
 * planned overhaul life is set to do: shape β ≈ 2.8–3.4 (wear-out failures;
 * "from memory": large diesel engines' in-service failures are usually fitted
 * with β between 2 and 4) and scales η that give an in-service failure before
 * the planned life of about 20 % for the two legacy engine types (18,000 and
 * 20,000 h lives, η 29,500 and 33,000 h) and 10–12 % for the two newer types
 * (24,000 and 25,000 h, η 45,000 and 48,000 h) — "common practice": a planned
 * overhaul life is set near the B10–B20 life, where 10–20 % of engines have
 * failed. The failed core credits are below the core credits ("common
 * practice": a failed core is worth less to the remanufacturer).
 */
export async function seedDemo(knex: Knex): Promise<{ created: boolean }> {
  const existing = await knex('workspaces').where({ slug: DEMO_WORKSPACE }).first();
  if (existing) return { created: false };
  const demo: DemoCase = readJson('aldervane-north-pit.json');
  const sets: { sets: Array<{ name: string; assumptions: unknown }> } = readJson('aldervane-assumption-sets.json');
  const hash = await hashPassword(DEMO_PASSWORD);
  const now = nowIso();

  await knex.transaction(async (trx) => {
    const settings = JSON.stringify({ units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 1 });
    const ws = await insertId(trx, 'workspaces', {
      slug: DEMO_WORKSPACE, name: 'Aldervane Copper — North Pit', currency: 'USD', settings, createdAt: now, updatedAt: now,
    });
    const other = await insertId(trx, 'workspaces', {
      slug: OTHER_WORKSPACE, name: 'Corrin Flats Iron (second demo site)', currency: 'AUD', settings, createdAt: now, updatedAt: now,
    });
    const users: Record<string, number> = {};
    for (const role of ['admin', 'analyst', 'approver', 'viewer'] as const) {
      users[role] = await createUser(trx, `${role}@aldervane.test`, `Demo ${role}`, hash);
      await trx('memberships').insert({ workspaceId: ws, userId: users[role], role, createdAt: now });
    }
    // The analyst is a consultant who also serves the second site; the others do not see it.
    await trx('memberships').insert({ workspaceId: other, userId: users.analyst, role: 'analyst', createdAt: now });
    const corrinAdmin = await createUser(trx, 'admin@corrin.test', 'Demo admin (Corrin Flats)', hash);
    await trx('memberships').insert({ workspaceId: other, userId: corrinAdmin, role: 'admin', createdAt: now });
    await seedSecondSite(trx, other, corrinAdmin, users.analyst, now);

    const audit = { version: 1, createdBy: users.admin, updatedBy: users.admin, createdAt: now, updatedAt: now };
    const engineIds: Record<string, number> = {};
    for (const e of demo.engines) {
      const { id, ...fields } = e;
      engineIds[id] = await insertId(trx, 'engine_types', { workspaceId: ws, key: id, name: ENGINE_NAMES[id] ?? id, ...fields, ...audit });
    }
    const offerIds: Record<string, number> = {};
    // Each demo offer's failedCoreCredit (in the scenario file) is somewhat below its coreCredit:
    // common practice: a failed core is worth less to the remanufacturer; figure invented for the demo.
    for (const o of demo.repowerOffers) {
      const { id, engineId, ...fields } = o;
      offerIds[id] = await insertId(trx, 'repower_offers', {
        workspaceId: ws, key: id, supplier: SUPPLIERS[id] ?? '', engineTypeId: engineIds[engineId], ...fields, ...audit,
      });
    }
    for (const t of demo.trucks) {
      const { id, engineId, repowerOfferId, ...fields } = t;
      await trx('trucks').insert({
        workspaceId: ws, unitNumber: id, payloadClass: id.startsWith('T3') ? '300 t' : '230 t',
        engineTypeId: engineIds[engineId], repowerOfferId: offerIds[repowerOfferId] ?? null, ...fields, ...audit,
      });
    }
    const truckIds: Record<string, number> = Object.fromEntries(
      (await trx('trucks').where({ workspaceId: ws }).select('id', 'unitNumber')).map((t) => [t.unitNumber, t.id]),
    );
    const setIds: Record<string, number> = {};
    for (const s of sets.sets) {
      setIds[s.name] = await insertId(trx, 'assumption_sets', { workspaceId: ws, name: s.name, ...assumptionSetColumns(s.assumptions as Record<string, unknown>), ...audit });
    }
    // A draft business case over the whole fleet, so the demo opens on results.
    const truckRows = await trx('trucks').where({ workspaceId: ws }).orderBy('unitNumber').select('id');
    await trx('business_cases').insert({
      workspaceId: ws,
      name: 'North Pit fleet — base assumptions',
      assumptionSetId: setIds.Base,
      selection: JSON.stringify(truckRows.map((t) => ({ truckId: t.id, repowerOfferId: null }))),
      plan: JSON.stringify({ budgets: { '0': 3_000_000, '1': 12_000_000, '2': 10_000_000 }, swapsPerMonth: 2, startMonth: '2027-01' }),
      status: 'draft',
      version: 1,
      createdBy: users.analyst,
      updatedBy: users.analyst,
      createdAt: now,
      updatedAt: now,
    });
    const record = await seedApprovedCase(trx, ws, users, setIds.Base, truckIds);
    await trx.batchInsert('truck_readings', demoReadingRows(ws, record, truckIds, engineIds, audit), 200);
    await trx('audit_log').insert({ workspaceId: ws, userId: null, action: 'seed', entity: 'workspace', entityId: String(ws), before: null, after: JSON.stringify({ slug: DEMO_WORKSPACE }), at: now });
  });
  return { created: true };
}
