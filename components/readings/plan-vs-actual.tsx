'use client';

import { Axis, Grid, LineSeries, XYChart, buildChartTheme } from '@visx/xychart';
import { useState } from 'react';
import { formatMoney, formatNumber, formatPercent, type NegativeStyle } from '@/lib/format';
import { forFiscalYear, type Figures } from '@/lib/readings/plan-vs-actual';
import type { PlanVsActualView } from '@/lib/readings/plan-vs-actual-load';

const theme = buildChartTheme({
  backgroundColor: '#ffffff',
  colors: ['#8c837b', '#35618f'],
  gridColor: '#e3e4e1',
  gridColorDark: '#5d646d',
  tickLength: 4,
  svgLabelSmall: { fill: '#5d646d', fontSize: 11 },
  svgLabelBig: { fill: '#15181c', fontSize: 12 },
  xAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
  yAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
  xTickLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
});
type Pt = { x: number; y: number; label: string };

const POLICY_NAME = { keep: 'Keep', rebuild: 'Rebuild', repower: 'Repower' } as const;
const variance = (actual: number, expected: number) => (expected > 0 ? actual / expected - 1 : null);
const signedPercent = (v: number | null) => (v === null ? '—' : `${v > 0 ? '+' : ''}${formatPercent(v, 1)}`);

/** Forecast against realised cumulative saving, months since the plan's start on x, both axes from zero. */
function SavingChart({ view, currency }: { view: PlanVsActualView; currency: string }) {
  let f = 0;
  let r = 0;
  const forecast: Pt[] = [{ x: 0, y: 0, label: '' }];
  const realised: Pt[] = [{ x: 0, y: 0, label: '' }];
  for (const m of view.figures.fleetMonths) {
    f += m.forecastSaving;
    r += m.saving;
    forecast.push({ x: m.index + 1, y: f / 1e6, label: m.month });
    realised.push({ x: m.index + 1, y: r / 1e6, label: m.month });
  }
  const ys = [...forecast, ...realised].map((p) => p.y);
  const lo = Math.min(0, ...ys);
  const hi = Math.max(0, ...ys);
  const title = `Cumulative saving against rebuilding, forecast and realised (${currency} M)`;
  return (
    <figure className="card p-3" data-testid="actuals-chart">
      <figcaption className="mb-1 text-sm font-semibold">{title}</figcaption>
      <ul className="flex gap-3 text-xs text-muted" aria-label="Legend">
        <li className="inline-flex items-center gap-1"><span aria-hidden className="inline-block h-0.5 w-4" style={{ background: '#8c837b' }} />Forecast (the approved case)</li>
        <li className="inline-flex items-center gap-1"><span aria-hidden className="inline-block h-0.5 w-4" style={{ background: '#35618f' }} />Realised (readings)</li>
      </ul>
      <div role="img" aria-label={title} style={{ height: 260 }}>
        <XYChart height={260} margin={{ top: 16, right: 20, bottom: 44, left: 72 }} theme={theme} xScale={{ type: 'linear', domain: [0, Math.max(1, forecast.at(-1)!.x)] }} yScale={{ type: 'linear', domain: [lo, hi === lo ? 1 : hi], nice: true }}>
          <Grid columns={false} numTicks={5} />
          <Axis orientation="bottom" label={`Months since ${view.startMonth}`} numTicks={8} />
          <Axis orientation="left" labelOffset={44} label={`${currency} M`} numTicks={5} tickFormat={(v) => formatNumber(Number(v), 1)} />
          <LineSeries dataKey="Forecast" data={forecast} xAccessor={(d) => d.x} yAccessor={(d) => d.y} colorAccessor={() => '#8c837b'} />
          <LineSeries dataKey="Realised" data={realised} xAccessor={(d) => d.x} yAccessor={(d) => d.y} colorAccessor={() => '#35618f'} />
        </XYChart>
      </div>
    </figure>
  );
}

function FleetFigures({ t, currency, neg }: { t: Figures; currency: string; neg: NegativeStyle }) {
  const row = (label: string, actual: string, planned: string, v: number | null, testId: string) => (
    <tr data-testid={testId}>
      <th scope="row" className="text-left font-normal">{label}</th>
      <td className="text-right tabular-nums">{actual}</td>
      <td className="text-right tabular-nums">{planned}</td>
      <td className="text-right tabular-nums">{signedPercent(v)}</td>
    </tr>
  );
  return (
    <table className="data-table max-w-3xl" data-testid="actuals-fleet">
      <thead>
        <tr><th className="text-left">Fleet</th><th className="text-right">Actual</th><th className="text-right">Case</th><th className="text-right">Variance</th></tr>
      </thead>
      <tbody>
        {row('Operating hours (h; case: its annual hours pro rata)', formatNumber(t.hours), formatNumber(t.forecastHours), variance(t.hours, t.forecastHours), 'fleet-hours')}
        {row('Fuel burned (L; case: its burn for the actual hours)', formatNumber(t.litres), formatNumber(t.expectedLitres), variance(t.litres, t.expectedLitres), 'fleet-fuel')}
        {row(`Fuel cost at the case's prices (${currency})`, formatMoney(t.fuelCost, { negative: neg }), formatMoney(t.expectedFuelCost, { negative: neg }), variance(t.fuelCost, t.expectedFuelCost), 'fleet-fuel-cost')}
        {row('Overhauls', formatNumber(t.overhauls), formatNumber(t.expectedOverhauls, 1), null, 'fleet-overhauls')}
        {row('In-service failures', formatNumber(t.failures), formatNumber(t.expectedFailures, 1), null, 'fleet-failures')}
        {row('Repowers done', formatNumber(t.repowers), formatNumber(t.expectedRepowers, 1), null, 'fleet-repowers')}
        {row('Days down', formatNumber(t.daysDown, 1), formatNumber(t.expectedDaysDown, 1), variance(t.daysDown, t.expectedDaysDown), 'fleet-days-down')}
        {row(`Capital spent (${currency})`, formatMoney(t.capital, { negative: neg }), formatMoney(t.plannedCapital, { negative: neg }), variance(t.capital, t.plannedCapital), 'fleet-capital')}
        {row(`Saving against rebuilding (${currency})`, formatMoney(t.saving, { negative: neg }), formatMoney(t.forecastSaving, { negative: neg }), null, 'fleet-saving')}
      </tbody>
    </table>
  );
}

/** The approved case's plan against actual: fiscal year selector, fleet figures, a table per truck with flags, the saving chart. */
export function PlanVsActualPanel({ view, negativeStyle }: { view: PlanVsActualView; negativeStyle: NegativeStyle }) {
  const [year, setYear] = useState<number | null>(null);
  const shown = forFiscalYear(view.figures, year);
  const tol = view.tolerancePercent;
  const neg = negativeStyle;
  if (view.figures.fleetMonths.length === 0) {
    return <p className="card p-4 text-sm" data-testid="actuals-empty">No readings recorded after the approval ({view.approvedMonth}) yet. Record or import them on the fleet&apos;s readings page.</p>;
  }
  const flagged = shown.trucks.filter((t) => t.flags.length);
  return (
    <div className="space-y-4">
      <p className="text-sm text-muted">
        Approved {view.approvedMonth}; readings {view.figures.fleetMonths[0].month} to {view.latestMonth}. The case&apos;s figures are its frozen forecast under the proposal&apos;s policy per truck; the saving is what rebuilding would have cost on the actual hours minus what the proposal cost (actual fuel at the case&apos;s prices, capital spent, other costs at the case&apos;s rate an hour). Trucks whose hours or burn stray beyond ± {formatNumber(tol, 1)} % (the workspace setting) are flagged.
      </p>
      <label className="text-sm">
        Period{' '}
        <select className="field ml-1 w-auto" data-testid="actuals-year" value={year ?? ''} onChange={(e) => setYear(e.target.value === '' ? null : Number(e.target.value))}>
          <option value="">Since approval (to {view.latestMonth})</option>
          {view.figures.fiscalYears.map((y) => (
            <option key={y} value={y}>FY{y}{y === view.figures.fleetMonths.at(-1)?.fiscalYear ? ' to date' : ''}</option>
          ))}
        </select>
      </label>
      <FleetFigures t={shown.fleet} currency={view.currency} neg={neg} />
      <p className="text-sm" data-testid="actuals-flag-summary">{flagged.length === 0 ? `No truck strays beyond ± ${formatNumber(tol, 1)} %.` : `${flagged.length} truck${flagged.length === 1 ? '' : 's'} beyond ± ${formatNumber(tol, 1)} %: ${flagged.map((t) => t.unit).join(', ')}.`}</p>
      <div className="overflow-x-auto">
        <table className="data-table" data-testid="actuals-trucks">
          <thead>
            <tr>
              <th className="text-left">Truck</th>
              <th className="text-left">Policy</th>
              <th className="text-right">Hours (h)</th>
              <th className="text-right">Case hours (h)</th>
              <th className="text-right">Hours var.</th>
              <th className="text-right">Fuel (L)</th>
              <th className="text-right">Case fuel for those hours (L)</th>
              <th className="text-right">Burn var.</th>
              <th className="text-right">Events (case)</th>
              <th className="text-right">Days down (case)</th>
              <th className="text-right">Capital ({view.currency})</th>
              <th className="text-right">Planned ({view.currency})</th>
              <th className="text-right">Saving ({view.currency})</th>
              <th className="text-right">Forecast ({view.currency})</th>
              <th className="text-left">Flags</th>
            </tr>
          </thead>
          <tbody>
            {shown.trucks.map((t) => {
              const x = t.total;
              return (
                <tr key={t.unit} data-testid={`actuals-truck-${t.unit}`} className={t.flags.length ? 'bg-amber-50' : undefined}>
                  <th scope="row" className="text-left">{t.unit}</th>
                  <td>{POLICY_NAME[t.policy]}</td>
                  <td className="text-right tabular-nums">{formatNumber(x.hours)}</td>
                  <td className="text-right tabular-nums">{formatNumber(x.forecastHours)}</td>
                  <td className="text-right tabular-nums" data-testid="hours-variance">{signedPercent(t.hoursVariance)}</td>
                  <td className="text-right tabular-nums">{formatNumber(x.litres)}</td>
                  <td className="text-right tabular-nums">{formatNumber(x.expectedLitres)}</td>
                  <td className="text-right tabular-nums" data-testid="burn-variance">{signedPercent(t.burnVariance)}</td>
                  <td className="text-right tabular-nums">{formatNumber(x.overhauls + x.failures + x.repowers)} ({formatNumber(x.expectedOverhauls + x.expectedFailures + x.expectedRepowers, 1)})</td>
                  <td className="text-right tabular-nums">{formatNumber(x.daysDown, 1)} ({formatNumber(x.expectedDaysDown, 1)})</td>
                  <td className="text-right tabular-nums">{formatMoney(x.capital, { negative: neg })}</td>
                  <td className="text-right tabular-nums">{formatMoney(x.plannedCapital, { negative: neg })}</td>
                  <td className="text-right tabular-nums">{formatMoney(x.saving, { negative: neg })}</td>
                  <td className="text-right tabular-nums">{formatMoney(x.forecastSaving, { negative: neg })}</td>
                  <td data-testid="flags">{t.flags.length ? t.flags.map((f) => (f === 'burn' ? 'burn' : 'hours')).join(', ') : t.months.length ? '' : 'no readings'}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <SavingChart view={view} currency={view.currency} />
    </div>
  );
}
