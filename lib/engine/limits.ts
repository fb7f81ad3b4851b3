/**
 * The engine's own guard against a run that would not end: however it is
 * called (a validated case, a trusted clone, a failure-age provider), one
 * policy run of one truck books at most `MAX_EVENTS_PER_RUN` events
 * (overhauls, failures, repowers) and then stops with an `EventLimitError`.
 *
 * Why 10,000: within the case file's ranges (docs/methodology.md, "Input
 * limits") a run has at most 500,000 hours and an event at most every
 * ~240 hours (the median life of a 500 h Weibull scale at shape 0.5,
 * 500 · (ln 2)^2), so about 2,100 events on the median path, and about 1,130
 * expected failures when Monte Carlo samples them (mean life
 * η·Γ(1 + 1/β) ≥ 0.8856 · 500 h). 10,000 is far above any real case and
 * still bounds the memory of a run's event log to a few hundred kilobytes.
 */
export const MAX_EVENTS_PER_RUN = 10_000;

/** Thrown when one policy run of a truck would book more than `MAX_EVENTS_PER_RUN` events. */
export class EventLimitError extends Error {
  readonly truckId: string;
  readonly policy: string;
  readonly limit: number;
  constructor(truckId: string, policy: string, limit = MAX_EVENTS_PER_RUN) {
    super(
      `truck ${truckId}: the ${policy} policy would book more than ${limit.toLocaleString('en-US')} engine events ` +
        '(overhauls, failures, repowers) in one run; check the life hours and the Weibull shape and scale of its engines',
    );
    this.name = 'EventLimitError';
    this.truckId = truckId;
    this.policy = policy;
    this.limit = limit;
  }
}
