'use client';
import { useMemo, useState } from 'react';
import useSWR from 'swr';
import { ApiError, fetcher, sendJson } from '@/lib/fetcher';
import { formatNumber, formatPercent, type NegativeStyle } from '@/lib/format';
import { money, moneyScale } from './format';
import { HistogramChart, RunningMeanChart } from './histogram-chart';
import { DistributionRows, type DistributionDraft } from './mc-setup';
import { HEADLINE_LABEL } from '@/lib/cases/valuation';
import type { DriverView, Headline, RunView, Summary } from './types';

/** Monte Carlo: set-up (distribution per driver, iterations, seed), progress with cancel, then the results. */
export function MonteCarloPanel(props: { base: string; drivers: DriverView[]; truckId: string | null; currency: string; negative: NegativeStyle; canRun: boolean; headline?: Headline }) {
  const { base, drivers, currency, negative } = props;
  const fuel = drivers.find((d) => d.id === 'fuelPrice');
  // a starting point a reader recognises: fuel price skewed upwards, everything else as in the case
  const [dists, setDists] = useState<Record<string, DistributionDraft>>(() => {
    const out: Record<string, DistributionDraft> = {};
    if (fuel) out.fuelPrice = { kind: 'triangular', min: fuel.base * 0.85, mode: fuel.base, max: fuel.base * 1.3 };
    return out;
  });
  const [iterations, setIterations] = useState(2000);
  const [seed, setSeed] = useState(1);
  const [sampleFailures, setSampleFailures] = useState(true);
  const [runId, setRunId] = useState<string | null>(null);
  const [error, setError] = useState<ApiError | null>(null);
  const [busy, setBusy] = useState(false);

  const { data: list } = useSWR<{ runs: { id: string }[] }>(`${base}/monte-carlo`, fetcher);
  const shownId = runId ?? list?.runs[0]?.id ?? null;
  const { data: runData, mutate } = useSWR<{ run: RunView }>(shownId ? `${base}/monte-carlo/${shownId}` : null, fetcher, {
    refreshInterval: (d) => (d?.run.status === 'running' ? 400 : 0),
    // SWR's default skips a fetch of the same key within 2 s, which would hold the poll to one every 2 s
    dedupingInterval: 0,
  });
  const run = runData?.run;
  const problems = useMemo(() => {
    const m = new Map<string, string>();
    error?.problems.forEach((p) => {
      const i = /^distributions\[(\d+)\]/.exec(p.path);
      const entry = i ? Object.keys(dists).filter((k) => dists[k].kind !== 'fixed')[Number(i[1])] : undefined;
      if (entry) m.set(entry, p.message);
    });
    return m;
  }, [error, dists]);

  const start = async () => {
    setBusy(true);
    setError(null);
    try {
      const distributions = Object.entries(dists).filter(([, d]) => d.kind !== 'fixed').map(([driver, distribution]) => ({ driver, distribution }));
      const r = await sendJson<{ run: RunView }>(`${base}/monte-carlo`, 'POST', { iterations, seed, sampleFailures, distributions });
      setRunId(r.run.id);
      await mutate();
    } catch (e) {
      setError(e instanceof ApiError ? e : new ApiError(0, 'The run could not start.'));
    } finally {
      setBusy(false);
    }
  };
  const cancel = async () => {
    if (!run) return;
    try {
      await sendJson(`${base}/monte-carlo/${run.id}`, 'DELETE');
    } catch (e) {
      setError(e instanceof ApiError ? e : null);
    }
    await mutate();
  };

  const truck = props.truckId ? run?.result?.trucks.find((t) => t.id === props.truckId) : undefined;
  const summary: Summary | undefined = truck ? truck.deltaNpv : run?.result?.fleet.deltaNpv;
  const fleet = !truck;
  const label = truck ? `ΔNPV repower vs rebuild, truck ${truck.id}` : 'ΔNPV repower vs rebuild, every truck';
  const headlineValue = props.headline ? (truck ? props.headline.trucks[truck.id] : props.headline.fleetDeltaNpv) : undefined;
  const mark = props.headline && headlineValue !== undefined ? { value: headlineValue, label: HEADLINE_LABEL[props.headline.valuation] } : undefined;

  return (
    <section aria-labelledby="mc-title" className="card p-4">
      <h2 id="mc-title" className="text-base font-semibold">How likely is a loss</h2>
      <p className="mb-3 text-sm text-muted">
        Monte Carlo over the case: each iteration draws the chosen drivers from their distributions and, when asked, every engine&rsquo;s failure ages from
        its Weibull law (the first conditioned on the hours it has run). The same seed gives the same result.
      </p>
      {props.canRun ? (
        <>
          <div className="max-h-80 overflow-y-auto">
            <DistributionRows drivers={drivers} value={dists} problems={problems} onChange={(id, d) => setDists((x) => ({ ...x, [id]: d }))} />
          </div>
          <div className="mt-3 flex flex-wrap items-end gap-4">
            <label className="text-sm"><span className="label">Iterations</span>
              <input type="number" className="field w-28" min={10} max={100000} value={iterations} onChange={(e) => setIterations(Number(e.target.value))} aria-label="Iterations" />
            </label>
            <label className="text-sm"><span className="label">Seed</span>
              <input type="number" className="field w-28" min={0} value={seed} onChange={(e) => setSeed(Number(e.target.value))} aria-label="Seed" />
            </label>
            <label className="flex items-center gap-2 pb-1.5 text-sm">
              <input type="checkbox" checked={sampleFailures} onChange={(e) => setSampleFailures(e.target.checked)} /> Sample engine failures (Weibull)
            </label>
            <button type="button" className="btn btn-primary" onClick={start} disabled={busy || run?.status === 'running'}>Run Monte Carlo</button>
          </div>
          {error ? (
            <div role="alert" className="mt-2 text-sm text-loss">
              {error.message}
              {error.problems.length ? <ul className="list-inside list-disc">{error.problems.map((p) => <li key={p.path}>{p.path}: {p.message}</li>)}</ul> : null}
            </div>
          ) : null}
        </>
      ) : (
        <p className="text-sm text-muted">Your role can read the latest run; an analyst, approver or admin starts one.</p>
      )}

      {run ? (
        <div className="mt-4" aria-live="polite">
          <div className="flex items-center gap-3">
            <div role="progressbar" aria-label="Monte Carlo progress" aria-valuemin={0} aria-valuemax={run.iterations} aria-valuenow={run.done} className="h-2 w-80 overflow-hidden rounded bg-rule">
              <div className="h-full bg-ink transition-[width]" style={{ width: `${(100 * run.done) / run.iterations}%` }} />
            </div>
            <span className="text-sm" data-testid="mc-status">
              {run.done.toLocaleString('en-US')} of {run.iterations.toLocaleString('en-US')} iterations · {statusText(run.status)}
            </span>
            {run.status === 'running' && props.canRun ? <button type="button" className="btn btn-danger" onClick={cancel}>Cancel run</button> : null}
          </div>
          {run.error ? <p role="alert" className="mt-1 text-sm text-loss">{run.error}</p> : null}
        </div>
      ) : null}

      {summary && run?.result ? (
        <div className="mt-4 grid gap-4">
          <StatsTable summary={summary} fleet={fleet} currency={currency} negative={negative} iterations={run.result.iterations} />
          <HistogramChart summary={summary} fleet={fleet} currency={currency} label={label} negative={negative} headline={mark} />
          {mark && props.headline ? <HeadlineCheck summary={summary} fleet={fleet} currency={currency} negative={negative} headline={mark.value} valuation={props.headline.valuation} run={run} /> : null}
          <RunningMeanChart summary={summary} fleet={fleet} currency={currency} negative={negative} />
          {!truck ? <TruckRiskTable result={run.result} currency={currency} negative={negative} /> : null}
        </div>
      ) : null}
    </section>
  );
}

/**
 * The Monte Carlo mean beside the headline: with failures sampled and every
 * other input fixed the mean converges to the expected valuation (MODEL.md
 * section 11), so their difference, in standard errors of the mean
 * (sd/√n), says whether the two agree within sampling error.
 */
function HeadlineCheck(props: { summary: Summary; fleet: boolean; currency: string; negative: NegativeStyle; headline: number; valuation: Headline['valuation']; run: RunView }) {
  const { summary: s, fleet, negative, headline, valuation, run } = props;
  const n = s.count;
  const se = n > 1 && Number.isFinite(s.sd) ? s.sd / Math.sqrt(n) : null;
  const diff = s.mean - headline;
  const z = se !== null && se > 0 ? diff / se : null;
  const drawn = run.spec?.distributions.length ?? 0;
  const sampled = run.spec?.sampleFailures ?? true;
  const unit = `${props.currency} ${moneyScale(fleet).suffix}`;
  let verdict: string;
  if (!sampled) verdict = 'This run keeps every engine at its median failure age, so its mean tends to the median path, not to the expected valuation.';
  else if (valuation === 'median-path') verdict = 'The headline here is the median path; a run that samples failures tends to the expected valuation instead, so the two need not agree.';
  else if (drawn > 0) verdict = `This run also draws ${drawn === 1 ? 'one other input' : `${drawn} other inputs`}, so its mean may differ from the headline by more than sampling error (the NPV is not linear in them).`;
  else if (z === null) verdict = 'Too few iterations, or no spread, to give a standard error.';
  else if (Math.abs(z) <= 2) verdict = `This run samples failures only: its mean lies within ${formatNumber(Math.abs(z), 1)} standard errors of the headline, within sampling error.`;
  else verdict = `This run samples failures only, yet its mean lies ${formatNumber(Math.abs(z), 1)} standard errors from the headline: more than sampling error usually explains (beyond about 3, worth a look).`;
  return (
    <div className="text-sm" data-testid="mc-headline-check">
      <p className="text-xs text-muted">
        The copper line is the case&rsquo;s headline figure, {valuation === 'expected' ? 'expected over engine failures' : 'on the median failure path'}. With failures sampled and every other input fixed, the Monte Carlo mean should lie within sampling
        error of the expected headline (within about two standard errors of the mean, sd/√n).
      </p>
      <table className="data-table mt-1 w-auto">
        <thead>
          <tr>
            <th className="n">{HEADLINE_LABEL[valuation]} ({unit})</th>
            <th className="n">Monte Carlo mean ({unit})</th>
            <th className="n">Difference ({unit})</th>
            <th className="n">Standard error of the mean ({unit})</th>
            <th className="n">Difference (standard errors)</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <td className="n" data-testid="mc-headline">{money(headline, fleet, negative)}</td>
            <td className="n" data-testid="mc-mean">{money(s.mean, fleet, negative)}</td>
            <td className="n">{money(diff, fleet, negative)}</td>
            <td className="n">{se === null ? '—' : money(se, fleet, negative)}</td>
            <td className="n" data-testid="mc-z">{z === null ? '—' : formatNumber(z, 2, negative)}</td>
          </tr>
        </tbody>
      </table>
      <p className="mt-1 text-xs" data-testid="mc-headline-verdict">{verdict}</p>
    </div>
  );
}

function statusText(s: RunView['status']): string {
  return { running: 'running', done: 'finished', cancelled: 'cancelled (figures from the iterations done)', 'timed-out': 'stopped at the time limit (figures from the iterations done)', failed: 'failed' }[s];
}

function StatsTable({ summary: s, fleet, currency, negative, iterations }: { summary: Summary; fleet: boolean; currency: string; negative: NegativeStyle; iterations: number }) {
  const cells: [string, string][] = [
    ['Mean', money(s.mean, fleet, negative)], ['SD', money(s.sd, fleet, negative)], ['P5', money(s.p5, fleet, negative)], ['P10', money(s.p10, fleet, negative)],
    ['P50', money(s.p50, fleet, negative)], ['P90', money(s.p90, fleet, negative)], ['P95', money(s.p95, fleet, negative)],
  ];
  return (
    <div>
      <p className="mb-1 text-sm" data-testid="mc-loss">
        Chance the repower loses money against rebuilding: <strong className={s.probNegative > 0 ? 'text-loss' : 'text-gain'}>{formatPercent(s.probNegative)}</strong>{' '}
        <span className="text-muted">({iterations.toLocaleString('en-US')} iterations)</span>
      </p>
      <table className="data-table w-auto" data-testid="mc-stats">
        <thead><tr>{cells.map(([k]) => <th key={k} className="n">{k} ({currency} {moneyScale(fleet).suffix})</th>)}</tr></thead>
        <tbody><tr>{cells.map(([k, v]) => <td key={k} className="n">{v}</td>)}</tr></tbody>
      </table>
    </div>
  );
}

function TruckRiskTable({ result, currency, negative }: { result: NonNullable<RunView['result']>; currency: string; negative: NegativeStyle }) {
  return (
    <div className="max-h-96 overflow-y-auto">
      <table className="data-table" data-testid="mc-trucks">
        <thead>
          <tr>
            <th>Truck</th>
            <th className="n">Mean ΔNPV ({currency} k)</th>
            <th className="n">P10</th>
            <th className="n">P50</th>
            <th className="n">P90</th>
            <th className="n">Chance of a loss</th>
            <th className="n">Repower best in</th>
          </tr>
        </thead>
        <tbody>
          {result.trucks.map((t) => (
            <tr key={t.id}>
              <td className="font-mono text-xs">{t.id}</td>
              <td className="n">{money(t.deltaNpv.mean, false, negative)}</td>
              <td className="n">{money(t.deltaNpv.p10, false, negative)}</td>
              <td className="n">{money(t.deltaNpv.p50, false, negative)}</td>
              <td className="n">{money(t.deltaNpv.p90, false, negative)}</td>
              <td className="n">{formatPercent(t.deltaNpv.probNegative)}</td>
              <td className="n">{formatPercent(t.bestShare.repower)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

