import type { UnitSystem } from '@/lib/display-units';
import type { NumberFormat } from '@/lib/number-input';
import type { NegativeStyle } from '@/lib/format';

/** What a page tells its client components about the workspace and the caller. */
export type WorkspaceView = { slug: string; canEdit: boolean; units: UnitSystem; negativeStyle: NegativeStyle; currency: string; numberFormat: NumberFormat };

export type Versioned = { id: number; version: number; updatedAt: string };

export type TruckRow = Versioned & {
  unitNumber: string; payloadClass: string; engineTypeId: number; repowerOfferId: number | null; engineKey: string; offerKey: string | null;
  engineHours: number; remainingLifeHours: number; annualHours: number; loadFactor: number; tonnesPerHour: number;
  fuelBurnLitresPerHour: number | null; notes: string;
};
export type EngineRow = Versioned & {
  key: string; name: string; ratedKw: number; bsfcGPerKwh: number; lifeHours: number; weibullShape: number; weibullScaleHours: number;
  overhaulCost: number; overhaulDowntimeDays: number; failureCost: number; failureDowntimeDays: number; serviceIntervalHours: number;
  sumpLitres: number; serviceKitCost: number; serviceLabourHours: number; topUpLitresPerHour: number; notes: string;
};
export type OfferRow = Versioned & {
  key: string; supplier: string; engineTypeId: number; engineKey: string; modulePrice: number; installCost: number; coreCredit: number;
  failedCoreCredit: number | null; downtimeDays: number; productivityGain: number; timing: 'at-overhaul' | 'now'; notes: string;
};
export type AssumptionSetRow = Versioned & { name: string; notes: string; assumptions: Record<string, unknown> & { depreciation: { method: string; years?: number } } };

export const api = (slug: string, path: string) => `/api/workspaces/${slug}/${path}`;
