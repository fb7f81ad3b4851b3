/**
 * Public API of the finance engine (MODEL.md). Pure: no Next, React, database
 * or I/O. Case in (`case/1`), numbers out (`case-result/1`).
 */
export { evaluateCase, evaluateCaseDetailed, evaluateNpvs, evaluateTruck } from './evaluate';
export * from './types';
export {
  ZERO,
  isZero,
  npv,
  discountFactor,
  capitalRecoveryFactor,
  capitalRecovery,
  equivalentAnnualWorth,
  equivalentAnnualCost,
  pmt,
  mirr,
  paybackYears,
  firstNonZero,
  countSignChanges,
} from './time-value';
export { irr, findIrrRoots, scanIrrRoots, presentValueAt, refineRoot, irrGridRate } from './irr';
export {
  MACRS_HALF_YEAR_PERCENT,
  macrsSchedule,
  straightLineSchedule,
  decliningBalanceSchedule,
  depreciationSchedule,
  placeSchedule,
  addSpendInto,
} from './depreciation';
export { powerDemandKw, modelledBurnLitresPerHour, calibrationFactor, co2Tonnes } from './fuel';
export {
  weibullReliability,
  weibullCdf,
  conditionalReliability,
  medianFailureAge,
  medianResidualLife,
  sampleWeibullAge,
  cumulativeHazard,
  unitExponential,
  weibullAgeFromExponential,
} from './reliability';
export { horizonYears, priceIndex } from './setup';
export { EventLimitError, MAX_EVENTS_PER_RUN } from './limits';
export { countOilServices } from './simulate';
export { npvFromTotals, residualCredit } from './cash-flow';
export { bestPolicy, bestPolicyIndex, comparePolicies } from './results';
export { rollUpFleet, capitalSpent } from './fleet';
export {
  kwToHp,
  hpToKw,
  litresToUsGallons,
  usGallonsToLitres,
  gPerKwhToLbPerHpH,
  lbPerHpHToGPerKwh,
  litresPerHourToGallonsPerHour,
  gallonsPerHourToLitresPerHour,
} from './units';
export { validateCase, CaseValidationError } from '@/lib/validation/case';
export type { CaseFile, CaseFileInput, CaseProblem } from '@/lib/validation/case';
export { fleetBestNpv } from './npv-only';
export type { CaseNpvs } from './npv-only';
