'use client';
import { useRouter } from 'next/navigation';
import { useEffect, useMemo, useState } from 'react';
import useSWR from 'swr';
import { ApiError, fetcher, sendJson } from '@/lib/fetcher';
import { formatNumber, formatPercent, type NegativeStyle } from '@/lib/format';
import { MEASURE_LABELS, measureLabel, measureSummary, runMeasure, type RunMeasure } from '@/lib/risk/measures';
import { driverValue, money, moneyScale } from './format';
import { HistogramChart, RunningMeanChart } from './histogram-chart';
import { DistributionRows, type DistributionDraft } from './mc-setup';
import { HEADLINE_LABEL } from '@/lib/cases/valuation';
import type { Choice } from './risk-workbench';
import type { DriverView, Headline, RunsAnswer, RunView, Summary } from './types';

type Spec = NonNullable<RunView['spec']>;
type Distributions = Record<string, DistributionDraft>;

/** The measure of a workbench choice, as a run records it. */
function measureOf(choice: Choice): { measure: RunMeasure; truckId?: string } {
  return choice.startsWith('truck:') ? { measure: 'truck-delta', truckId: choice.slice(6) } : { measure: choice as RunMeasure };
}

/** The workbench choice a run was read on. */
export function choiceOfSpec(spec: Spec): Choice {
  const m = runMeasure(spec);
  return m === 'truck-delta' ? `truck:${spec.truckId ?? ''}` : m;
}

function distributionsOf(spec: Spec): Distributions {
  return Object.fromEntries(spec.distributions.map((d) => [d.driver, d.distribution]));
}

/** The drawn distributions of a form or a run, in a stable order, to compare the two. */
function drawnKey(d: Distributions): string {
  return JSON.stringify(Object.entries(d).filter(([, x]) => x.kind !== 'fixed').sort(([a], [b]) => (a < b ? -1 : 1)));
}

/** "2026-12-03 12:40 UTC" from an ISO time. */
export function utcTime(iso: string | null | undefined): string {
  return iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : '—';
}

/**
 * Monte Carlo: set-up (distribution per driver, iterations, seed), progress
 * with cancel, then the results under a line that says what made them
 * (settings, seed, measure, author, time). Opening a run — the latest on
 * arrival, or any from the list of recent runs — puts its settings back in the
 * form, so the form and the result below agree until the form is changed
 * (then the panel says so). A finished run read on the proposal can be
 * pinned to the case while it is a draft or sent back for changes.
 */
export function MonteCarloPanel(props: {
  base: string;
  drivers: DriverView[];
  choice: Choice;
  onChoice: (c: Choice) => void;
  currency: string;
  negative: NegativeStyle;
  canRun: boolean;
  headline?: Headline;
  initialTruck: string | null;
}) {
  const { base, drivers, currency, negative, choice, onChoice } = props;
  const router = useRouter();
  const fuel = drivers.find((d) => d.id === 'fuelPrice');
  // a starting point a reader recognises: fuel price skewed upwards, everything else as in the case
  const [dists, setDists] = useState<Distributions>(() => {
    const out: Distributions = {};
    if (fuel) out.fuelPrice = { kind: 'triangular', min: fuel.base * 0.85, mode: fuel.base, max: fuel.base * 1.3 };
    return out;
  });
  const [iterations, setIterations] = useState(2000);
  const [seed, setSeed] = useState(1);
  const [sampleFailures, setSampleFailures] = useState(true);
  const [runId, setRunId] = useState<string | null>(null);
  const [error, setError] = useState<ApiError | null>(null);
  const [busy, setBusy] = useState(false);
  // the run whose settings the form last took, and a counter that remounts the distribution inputs when it does
  const [restored, setRestored] = useState<{ id: string; choice: Choice } | null>(null);
  const [formKey, setFormKey] = useState(0);

  const { data: list, mutate: mutateList } = useSWR<RunsAnswer>(`${base}/monte-carlo`, fetcher);
  // on arrival: the latest run (on a truck's page, the latest run read on that truck)
  const defaultId = useMemo(() => {
    if (!list) return null;
    if (props.initialTruck) return list.runs.find((r) => r.spec?.measure === 'truck-delta' && r.spec.truckId === props.initialTruck)?.id ?? null;
    return list.runs[0]?.id ?? null;
  }, [list, props.initialTruck]);
  const shownId = runId ?? defaultId;
  const { data: runData, mutate } = useSWR<{ run: RunView }>(shownId ? `${base}/monte-carlo/${shownId}` : null, fetcher, {
    refreshInterval: (d) => (d?.run.status === 'running' ? 400 : 0),
    // SWR's default skips a fetch of the same key within 2 s, which would hold the poll to one every 2 s
    dedupingInterval: 0,
  });
  const run = runData?.run && runData.run.id === shownId ? runData.run : undefined;

  // a run opened: its settings go into the form (during render, so the form never shows other settings beside it)
  if (run?.spec && restored?.id !== run.id) {
    const spec = run.spec;
    setRestored({ id: run.id, choice: choiceOfSpec(spec) });
    setDists(distributionsOf(spec));
    setIterations(spec.iterations);
    setSeed(spec.seed);
    setSampleFailures(spec.sampleFailures);
    setFormKey((k) => k + 1);
    setError(null);
  }
  // …and its measure into the workbench's measure (another component: after render)
  // (formKey counts the restores: opening the shown run again restores its measure too)
  const restoredChoice = restored?.choice;
  useEffect(() => {
    if (restoredChoice) onChoice(restoredChoice);
    // only when a run's settings are taken, not when the reader changes the measure afterwards
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [formKey]);

  const problems = useMemo(() => {
    const m = new Map<string, string>();
    error?.problems.forEach((p) => {
      const i = /^distributions\[(\d+)\]/.exec(p.path);
      const entry = i ? Object.keys(dists).filter((k) => dists[k].kind !== 'fixed')[Number(i[1])] : undefined;
      if (entry) m.set(entry, p.message);
    });
    return m;
  }, [error, dists]);

  const formMeasure = measureOf(choice);
  const start = async () => {
    setBusy(true);
    setError(null);
    try {
      const distributions = Object.entries(dists).filter(([, d]) => d.kind !== 'fixed').map(([driver, distribution]) => ({ driver, distribution }));
      const r = await sendJson<{ run: RunView }>(`${base}/monte-carlo`, 'POST', { iterations, seed, sampleFailures, distributions, ...formMeasure });
      setRunId(r.run.id);
      await Promise.all([mutate(), mutateList()]);
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
    await Promise.all([mutate(), mutateList()]);
  };
  const open = (id: string) => {
    setRunId(id);
    // the same run again: take its settings back into the form
    if (id === shownId) setRestored(null);
  };
  const [pinError, setPinError] = useState<string | null>(null);
  const pin = async (pinned: boolean) => {
    if (!run || !list) return;
    setPinError(null);
    try {
      if (pinned) await sendJson(`${base}/pinned-run`, 'PUT', { runId: run.id, version: list.caseVersion });
      else await sendJson(`${base}/pinned-run?version=${list.caseVersion}`, 'DELETE');
    } catch (e) {
      setPinError(e instanceof ApiError ? e.message + (e.problems.length ? ` ${e.problems.map((p) => p.message).join('; ')}` : '') : 'The pin could not be changed.');
    }
    await mutateList();
    router.refresh(); // the page header names the pinned run
  };

  const spec = run?.spec;
  const measure = runMeasure(spec);
  const truckId = spec?.truckId ?? null;
  const summary: Summary | null = run?.result ? measureSummary(run.result, measure, truckId) : null;
  const fleet = measure !== 'truck-delta';
  const label = measureLabel(measure, truckId);
  const h = props.headline;
  const headlineValue = h
    ? measure === 'proposal' ? h.proposalDeltaNpv : measure === 'fleet-delta' ? h.fleetDeltaNpv : measure === 'fleet-best' ? h.fleetBestNpv : truckId ? h.trucks[truckId] : undefined
    : undefined;
  const mark = h && headlineValue !== undefined ? { value: headlineValue, label: HEADLINE_LABEL[h.valuation] } : undefined;
  const changed =
    !!spec &&
    (spec.iterations !== iterations || spec.seed !== seed || spec.sampleFailures !== sampleFailures || choiceOfSpec(spec) !== choice || drawnKey(distributionsOf(spec)) !== drawnKey(dists));
  const pinnedId = list?.pinnedRunId ?? null;
  const caseOpen = list ? list.caseStatus === 'draft' || list.caseStatus === 'returned' : false;

  return (
    <section aria-labelledby="mc-title" className="card p-4">
      <h2 id="mc-title" className="text-base font-semibold">How likely is a loss</h2>
      <p className="mb-3 text-sm text-muted">
        Monte Carlo over the case: each iteration draws the chosen drivers from their distributions and, when asked, every engine&rsquo;s failure ages from
        its Weibull law (the first conditioned on the hours it has run). The same seed gives the same result. Every run also sums the proposal, its policies fixed.
      </p>
      {props.canRun ? (
        <>
          <div className="max-h-80 overflow-y-auto">
            <DistributionRows key={formKey} drivers={drivers} value={dists} problems={problems} onChange={(id, d) => setDists((x) => ({ ...x, [id]: d }))} />
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
            <p className="pb-1.5 text-xs text-muted">Read on: {measureLabel(formMeasure.measure, formMeasure.truckId)} (the measure at the top)</p>
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
        <p className="text-sm text-muted">Your role can read the runs; an analyst, approver or admin starts one.</p>
      )}

      {run ? (
        <div className="mt-4" aria-live="polite">
          <Provenance run={run} drivers={drivers} pinned={pinnedId === run.id} />
          {changed ? (
            <p className="mt-1 text-xs text-caution" data-testid="mc-changed">
              The settings in the form differ from this run&rsquo;s; the figures below are this run&rsquo;s. Run again to see yours, or{' '}
              <button type="button" className="underline" onClick={() => open(run.id)}>put this run&rsquo;s settings back</button>.
            </p>
          ) : null}
          <PinControls run={run} canRun={props.canRun} caseOpen={caseOpen} caseStatus={list?.caseStatus ?? ''} pinned={pinnedId === run.id} measure={measure} onPin={pin} error={pinError} />
          <div className="mt-2 flex items-center gap-3">
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
      ) : list && list.runs.length === 0 ? (
        <p className="mt-4 text-sm text-muted">No Monte Carlo run of this case yet.</p>
      ) : null}

      {summary && run?.result ? (
        <div className="mt-4 grid gap-4">
          <StatsTable summary={summary} fleet={fleet} currency={currency} negative={negative} iterations={run.result.iterations} measure={measure} truckId={truckId} />
          <HistogramChart summary={summary} fleet={fleet} currency={currency} label={label} negative={negative} headline={mark} />
          {mark && h && measure !== 'fleet-best' ? <HeadlineCheck summary={summary} fleet={fleet} currency={currency} negative={negative} headline={mark.value} valuation={h.valuation} run={run} /> : null}
          <RunningMeanChart summary={summary} fleet={fleet} currency={currency} negative={negative} />
          {fleet ? <TruckRiskTable result={run.result} currency={currency} negative={negative} /> : null}
        </div>
      ) : run?.result ? (
        <p className="mt-4 text-sm text-muted">This run holds no figure for {label}.</p>
      ) : null}

      {list && list.runs.length > 0 ? <RunsList runs={list.runs} shownId={shownId} pinnedId={pinnedId} onOpen={open} /> : null}
    </section>
  );
}

/** Distribution parameters in the driver's unit, e.g. "triangular (min 0.85, mode 1.05, max 1.3)". */
function describeDistribution(d: DriverView | undefined, x: DistributionDraft): string {
  if (x.kind === 'fixed') return 'fixed';
  const fields = Object.entries(x).filter(([k]) => k !== 'kind');
  return `${x.kind} (${fields.map(([k, v]) => `${k} ${k === 'sd' && d?.unit.includes('%') ? `${formatNumber((v as number) * 100, 2)} %` : driverValue(d, v as number)}`).join(', ')})`;
}

/** What made the result below: settings, seed, measure, author and time. */
function Provenance({ run, drivers, pinned }: { run: RunView; drivers: DriverView[]; pinned: boolean }) {
  const spec = run.spec;
  const byId = new Map(drivers.map((d) => [d.id, d]));
  const measure = runMeasure(spec);
  return (
    <div className="rounded border border-rule bg-paper px-3 py-2 text-sm" data-testid="mc-provenance">
      <p>
        <strong>Run of {utcTime(run.createdAt)}</strong> by {run.author ? `${run.author.name || run.author.email} (${run.author.email})` : 'a removed account'}
        {run.finishedAt ? `, ended ${utcTime(run.finishedAt)}` : ''}
        {pinned ? <span className="ml-2 rounded bg-ink px-1.5 py-0.5 text-xs text-paper" data-testid="mc-pinned-badge">Pinned to the case</span> : null}
      </p>
      {spec ? (
        <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 gap-y-0.5 text-xs">
          <dt className="text-muted">Measure</dt>
          <dd data-testid="mc-prov-measure">{measureLabel(measure, spec.truckId)}</dd>
          <dt className="text-muted">Iterations</dt>
          <dd data-testid="mc-prov-iterations">{spec.iterations.toLocaleString('en-US')}</dd>
          <dt className="text-muted">Seed</dt>
          <dd data-testid="mc-prov-seed">{spec.seed}</dd>
          <dt className="text-muted">Engine failures</dt>
          <dd data-testid="mc-prov-failures">{spec.sampleFailures ? 'sampled from each engine’s Weibull law' : 'not sampled (every engine on its median failure path)'}</dd>
          <dt className="text-muted">Drivers drawn</dt>
          <dd data-testid="mc-prov-drivers">
            {spec.distributions.length === 0
              ? 'none (every other input as in the case)'
              : spec.distributions.map((d) => `${byId.get(d.driver)?.label ?? d.driver}: ${describeDistribution(byId.get(d.driver), d.distribution)}`).join('; ')}
          </dd>
        </dl>
      ) : null}
    </div>
  );
}

function PinControls(props: { run: RunView; canRun: boolean; caseOpen: boolean; caseStatus: string; pinned: boolean; measure: RunMeasure; onPin: (pin: boolean) => void; error: string | null }) {
  const { run, canRun, caseOpen, pinned, measure } = props;
  let body: React.ReactNode = null;
  if (!caseOpen && props.caseStatus) {
    body = pinned ? <span>This run is pinned; the case is {props.caseStatus}, so the pinned run is frozen with it.</span> : null;
  } else if (canRun && pinned) {
    body = <button type="button" className="btn" onClick={() => props.onPin(false)}>Unpin this run</button>;
  } else if (canRun && run.status === 'done' && measure === 'proposal' && run.result?.fleet.proposalNpv) {
    body = (
      <>
        <button type="button" className="btn" onClick={() => props.onPin(true)}>Pin this run to the case</button>
        <span className="text-muted">The decision summary and the submission quote the pinned run.</span>
      </>
    );
  } else if (canRun && run.status === 'done') {
    body = <span className="text-muted">Only a finished run read on the {MEASURE_LABELS.proposal} can be pinned.</span>;
  }
  if (!body && !props.error) return null;
  return (
    <div className="mt-2 flex flex-wrap items-center gap-3 text-xs" data-testid="mc-pin">
      {body}
      {props.error ? <span role="alert" className="text-loss">{props.error}</span> : null}
    </div>
  );
}

function RunsList({ runs, shownId, pinnedId, onOpen }: { runs: RunsAnswer['runs']; shownId: string | null; pinnedId: string | null; onOpen: (id: string) => void }) {
  return (
    <div className="mt-4">
      <h3 className="text-sm font-semibold">Recent runs</h3>
      <table className="data-table mt-1" data-testid="mc-runs">
        <thead>
          <tr>
            <th>Started</th>
            <th>By</th>
            <th>Measure</th>
            <th className="n">Iterations</th>
            <th className="n">Seed</th>
            <th>Failures</th>
            <th>Status</th>
            <th><span className="sr-only">Open</span></th>
          </tr>
        </thead>
        <tbody>
          {runs.map((r) => (
            <tr key={r.id} data-run={r.id} aria-current={r.id === shownId ? 'true' : undefined} className={r.id === shownId ? 'bg-paper' : undefined}>
              <td className="whitespace-nowrap">{utcTime(r.createdAt)}{r.id === pinnedId ? <span className="ml-1 text-xs font-semibold">· pinned</span> : null}</td>
              <td>{r.author ? r.author.name || r.author.email : '—'}</td>
              <td className="text-xs">{r.spec ? measureLabel(runMeasure(r.spec), r.spec.truckId) : '—'}</td>
              <td className="n">{r.iterations.toLocaleString('en-US')}</td>
              <td className="n">{r.spec?.seed ?? '—'}</td>
              <td className="text-xs">{r.spec ? (r.spec.sampleFailures ? 'sampled' : 'median path') : '—'}</td>
              <td className="text-xs">{statusText(r.status)}</td>
              <td>
                <button type="button" className="btn py-0.5 text-xs" onClick={() => onOpen(r.id)} aria-label={`Open the run of ${utcTime(r.createdAt)}`}>
                  {r.id === shownId ? 'Shown' : 'Open'}
                </button>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
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

function lossSentence(measure: RunMeasure, truckId: string | null): string {
  if (measure === 'proposal') return 'Chance the proposal loses money against rebuilding every engine';
  if (measure === 'fleet-delta') return 'Comparison — chance that repowering every truck loses money against rebuilding';
  if (measure === 'fleet-best') return 'Comparison — chance the best-mix fleet NPV is below zero';
  return `Chance the repower of truck ${truckId ?? '?'} loses money against rebuilding`;
}

function StatsTable({ summary: s, fleet, currency, negative, iterations, measure, truckId }: { summary: Summary; fleet: boolean; currency: string; negative: NegativeStyle; iterations: number; measure: RunMeasure; truckId: string | null }) {
  const cells: [string, string][] = [
    ['Mean', money(s.mean, fleet, negative)], ['SD', money(s.sd, fleet, negative)], ['P5', money(s.p5, fleet, negative)], ['P10', money(s.p10, fleet, negative)],
    ['P50', money(s.p50, fleet, negative)], ['P90', money(s.p90, fleet, negative)], ['P95', money(s.p95, fleet, negative)],
  ];
  return (
    <div>
      <p className="mb-1 text-sm" data-testid="mc-loss">
        {lossSentence(measure, truckId)}: <strong className={s.probNegative > 0 ? 'text-loss' : 'text-gain'}>{formatPercent(s.probNegative)}</strong>{' '}
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

