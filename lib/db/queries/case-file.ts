import 'server-only';
import type { Knex } from 'knex';
import { db } from '../index';
import { assumptionsOfRow } from '../assumption-columns';
import type { CaseTruckFigures } from '@/lib/validation/business-case';

/**
 * Builds a `case/1` object (MODEL.md section 10) from a workspace's stored data.
 * Stored column names are the case file's names, so rows map across directly;
 * database ids become the case file's string ids (engine `key`, offer `key`,
 * truck `unitNumber`). Validate the result with the case schema before use.
 */
export type CaseSelection = {
  name: string;
  assumptionSetId: number;
  /** Truck row ids; all trucks of the workspace when omitted. */
  truckIds?: number[];
  /** Per truck row id, an offer row id that replaces the truck's own offer. */
  offerOverrides?: Record<number, number | null | undefined>;
  /** Include every engine type and offer, not only those the trucks refer to (case file download). */
  includeAll?: boolean;
  /**
   * Per truck row id, the case's own figures in place of the register's (a
   * re-forecast case's figures from readings, `business_cases.truckFigures`).
   */
  truckFigures?: Record<string, CaseTruckFigures | undefined>;
  /**
   * Per engine type row id, the planned overhaul life the case adopts in place
   * of the library's (`business_cases.engineLives`, whole hours in the case
   * file's range): the evaluation, the export and the snapshots all read it.
   */
  engineLives?: Record<string, number | undefined>;
};

const ENGINE_FIELDS = [
  'ratedKw', 'bsfcGPerKwh', 'lifeHours', 'weibullShape', 'weibullScaleHours', 'overhaulCost', 'overhaulDowntimeDays',
  'failureCost', 'failureDowntimeDays', 'serviceIntervalHours', 'sumpLitres', 'serviceKitCost', 'serviceLabourHours', 'topUpLitresPerHour',
] as const;
const OFFER_FIELDS = ['modulePrice', 'installCost', 'coreCredit', 'downtimeDays', 'productivityGain', 'timing'] as const;
const TRUCK_FIELDS = ['engineHours', 'remainingLifeHours', 'annualHours', 'loadFactor', 'tonnesPerHour', 'fuelBurnLitresPerHour'] as const;

/** Optional offer fields: a null column (the model's default applies) is left out of the case file. */
const OPTIONAL_OFFER_FIELDS = ['failedCoreCredit'] as const;

const pick = (row: Record<string, unknown>, fields: readonly string[]) => Object.fromEntries(fields.map((f) => [f, row[f]]));
const pickSet = (row: Record<string, unknown>, fields: readonly string[]) =>
  Object.fromEntries(fields.filter((f) => row[f] !== null && row[f] !== undefined).map((f) => [f, row[f]]));

export async function buildCaseFile(workspaceId: number, sel: CaseSelection, k: Knex = db()) {
  const ws = await k('workspaces').where({ id: workspaceId }).first('currency');
  const set = await k('assumption_sets').where({ id: sel.assumptionSetId, workspaceId }).first();
  if (!ws || !set) throw new Error('Workspace or assumption set not found');
  let truckQuery = k('trucks').where({ workspaceId }).orderBy('unitNumber');
  if (sel.truckIds) truckQuery = truckQuery.whereIn('id', sel.truckIds);
  const registerTrucks = await truckQuery;
  const engines = await k('engine_types').where({ workspaceId }).orderBy('key');
  const offers = await k('repower_offers').where({ workspaceId }).orderBy('key');
  const engineKey = new Map<number, string>(engines.map((e) => [e.id, e.key]));
  const offerKey = new Map<number, string>(offers.map((o) => [o.id, o.key]));

  const truckOffer = (t: { id: number; repowerOfferId: number | null }) => {
    const o = sel.offerOverrides?.[t.id];
    return o === undefined || o === null ? t.repowerOfferId : o;
  };
  // the case's own figures replace the register's; an engine type it names must still be the workspace's
  const ownFigures = <T extends { id: number; engineTypeId: number }>(t: T): T => {
    const f = sel.truckFigures?.[String(t.id)];
    if (!f) return t;
    const { engineTypeId, ...figures } = f;
    return { ...t, ...figures, engineTypeId: engineTypeId !== undefined && engineKey.has(engineTypeId) ? engineTypeId : t.engineTypeId };
  };
  const trucks = registerTrucks.map(ownFigures);
  const usedOffers = new Set(trucks.map(truckOffer).filter((x): x is number => x != null));
  const usedEngines = new Set<number>(trucks.map((t) => t.engineTypeId));
  for (const o of offers) if (usedOffers.has(o.id)) usedEngines.add(o.engineTypeId);

  return {
    format: 'case/1' as const,
    name: sel.name,
    currency: ws.currency as string,
    assumptions: assumptionsOfRow(set),
    engines: engines
      .filter((e) => sel.includeAll || usedEngines.has(e.id))
      .map((e) => ({ id: e.key as string, ...pick(e, ENGINE_FIELDS), lifeHours: sel.engineLives?.[String(e.id)] ?? e.lifeHours })),
    repowerOffers: offers
      .filter((o) => sel.includeAll || usedOffers.has(o.id))
      .map((o) => ({ id: o.key as string, engineId: engineKey.get(o.engineTypeId) as string, ...pick(o, OFFER_FIELDS), ...pickSet(o, OPTIONAL_OFFER_FIELDS) })),
    trucks: trucks.map((t) => {
      const offerId = truckOffer(t);
      return {
        id: t.unitNumber as string,
        engineId: engineKey.get(t.engineTypeId) as string,
        repowerOfferId: (offerId == null ? undefined : offerKey.get(offerId)) as string,
        ...pick(t, TRUCK_FIELDS),
      };
    }),
  };
}
