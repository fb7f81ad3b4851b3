/** Shapes of the risk API's answers, as the screens read them. */
import type { BreakEven } from '@/lib/engine/sensitivity/break-even';
import type { SpiderLine, TornadoRow, TwoWayTable } from '@/lib/engine/sensitivity/analyses';
import type { MonteCarloResult, Summary } from '@/lib/engine/monte-carlo/stats';
import type { MetricInput, MonteCarloRequest } from '@/lib/validation/risk';

export type { BreakEven, SpiderLine, TornadoRow, TwoWayTable, MonteCarloResult, Summary, MetricInput, MonteCarloRequest };

export interface DriverView {
  id: string;
  label: string;
  unit: string;
  base: number;
  min: number;
  max: number | null;
  /** the driver's realistic default range in the case, clipped to its limits */
  realistic?: [number, number];
  /** where that range comes from (common practice / from memory) */
  rangeSource?: string;
}

/** The deterministic figures of the case in its own valuation (MODEL.md section 11), which the Monte Carlo histogram marks. */
export interface Headline {
  valuation: 'expected' | 'median-path';
  /** Σ over trucks of ΔNPV repower vs rebuild */
  fleetDeltaNpv: number;
  fleetBestNpv: number;
  /** Σ over trucks of npv(the proposal's policy) − npv(rebuild) */
  proposalDeltaNpv: number;
  /** ΔNPV repower vs rebuild by truck */
  trucks: Record<string, number>;
}

export interface DriversAnswer {
  case: { id: number; name: string; status: string; currency: string };
  headline: Headline;
  trucks: { id: string; engineId: string; repowerOfferId: string }[];
  truckId: string | null;
  drivers: DriverView[];
  proposal: {
    policies: Record<string, 'keep' | 'rebuild' | 'repower'>;
    /** each repowered truck's timing in the proposal (the fleet programme's) */
    timings?: Record<string, { kind: 'keep' | 'rebuild' | 'now' | 'event'; k: number; delayMonths: number }>;
    repower: number;
    keep: number;
    rebuild: number;
  };
}

export interface RunView {
  id: string;
  author: { name: string; email: string } | null;
  status: 'running' | 'done' | 'cancelled' | 'timed-out' | 'failed';
  iterations: number;
  done: number;
  createdAt: string;
  finishedAt: string | null;
  error: string | null;
  /** what the run was asked: iterations, seed, failures sampled or not, the drivers drawn, the measure it is read on (older runs name none) */
  spec?: Omit<MonteCarloRequest, 'measure'> & { measure?: MonteCarloRequest['measure'] };
  result: MonteCarloResult | null;
}

export interface RunsAnswer {
  runs: Omit<RunView, 'result'>[];
  pinnedRunId: string | null;
  caseVersion: number;
  caseStatus: string;
}
