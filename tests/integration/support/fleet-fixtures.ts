import type { Knex } from 'knex';

export const WS = 'aldervane-north-pit';
export const OTHER = 'corrin-flats';

/** Everything the register holds for one workspace, plus its audit rows: compared before and after a refusal. */
export async function snapshotWorkspace(k: Knex, slug: string) {
  const ws = await k('workspaces').where({ slug }).first('id', 'settings');
  const all = async (table: string) => k(table).where({ workspaceId: ws.id }).orderBy('id');
  return {
    settings: ws.settings,
    trucks: await all('trucks'),
    engines: await all('engine_types'),
    offers: await all('repower_offers'),
    sets: await all('assumption_sets'),
    documents: await all('quote_documents'),
    audit: (await all('audit_log')).length,
  };
}

export { userIds } from '../../support/test-db';

export const engineBody = (key: string) => ({
  key, name: `Test engine ${key}`, ratedKw: 2500, bsfcGPerKwh: 205, lifeHours: 21000, weibullShape: 3, weibullScaleHours: 24000,
  overhaulCost: 900000, overhaulDowntimeDays: 9, failureCost: 1400000, failureDowntimeDays: 28, serviceIntervalHours: 250,
  sumpLitres: 290, serviceKitCost: 850, serviceLabourHours: 5, topUpLitresPerHour: 0.12, notes: '',
});
export const offerBody = (key: string, engineTypeId: number) => ({
  key, supplier: 'Invented supplier', engineTypeId, modulePrice: 1500000, installCost: 140000, coreCredit: 100000,
  downtimeDays: 2.5, productivityGain: 0.01, timing: 'at-overhaul', notes: '',
});
export const truckBody = (unitNumber: string, engineTypeId: number, repowerOfferId: number | null = null) => ({
  unitNumber, payloadClass: '300 t', engineTypeId, repowerOfferId, engineHours: 12000, remainingLifeHours: 50000,
  annualHours: 6000, loadFactor: 0.5, tonnesPerHour: 800, fuelBurnLitresPerHour: null, notes: 'added in a test',
});
export const assumptions = {
  discountRate: 0.08, timing: 'end-of-year', horizonYears: null, inflation: 0.025, fuelPrice: 1.05, fuelEscalation: 0.03,
  fuelDensityKgPerL: 0.835, co2KgPerLitre: 2.697, lubePrice: 4.2, labourRate: 115, carbonPrice: 0, carbonEscalation: 0,
  marginPerTonne: 2.5, taxRate: 0.3, depreciation: { method: 'macrs', years: 7 }, rebuildAccounting: 'expense',
};
export const setBody = (name: string) => ({ name, notes: '', assumptions });
