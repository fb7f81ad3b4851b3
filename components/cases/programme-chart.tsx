'use client';

import { Axis, BarSeries, GlyphSeries, Grid, LineSeries, Tooltip, XYChart, buildChartTheme } from '@visx/xychart';
import type { ProgrammePeriodDto } from '@/lib/cases/programme-types';
import { formatMoney, formatNumber, type NegativeStyle } from '@/lib/format';
import { Figure, Legend } from './charts';

const CAPITAL = '#b0562b';
const CASH = '#35618f';

const theme = buildChartTheme({
  backgroundColor: '#ffffff',
  colors: [CAPITAL, CASH],
  gridColor: '#e3e4e1',
  gridColorDark: '#5d646d',
  tickLength: 4,
  svgLabelSmall: { fill: '#5d646d', fontSize: 11 },
  svgLabelBig: { fill: '#15181c', fontSize: 12 },
  xAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
  yAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
  xTickLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
});

type Pt = { label: string; value: number };

/** "FY2027 (now)" → "now" on the axis (the table below keeps the full name). */
const tick = (label: string) => label.replace(/^FY\d{4} \(now\)$/, 'now');

/**
 * The fleet programme by fiscal year of spend: planned capital (bars: the programme's swaps in their planned
 * months, no failures) and the expected cash flow of the chosen plan (line: failures included, after tax).
 * One money axis in thousands, from zero (zero is always on it, so a small bar looks small), and the same
 * figures as a table beneath for screen readers and print.
 */
export function ProgrammeChart({ periods, currency, negative }: { periods: ProgrammePeriodDto[]; currency: string; negative: NegativeStyle }) {
  const capital: Pt[] = periods.map((p) => ({ label: p.label, value: p.plannedCapital / 1000 }));
  const cash: Pt[] = periods.map((p) => ({ label: p.label, value: p.expectedCashFlow / 1000 }));
  const k = (x: number | null) => (x === null ? 'no limit' : formatMoney(x, { scale: 'k', negative }));
  const title = `The fleet by fiscal year of spend: planned capital and expected cash flow (${currency} k)`;
  return (
    <div className="space-y-2">
      <Figure
        testId="programme-chart"
        height={300}
        title={title}
        legend={<Legend items={[{ label: 'Planned capital: the programme\'s swaps in their planned months', colour: CAPITAL, shape: 'box' }, { label: 'Expected cash flow of the plan, after tax (failures included)', colour: CASH, shape: 'line' }]} />}
        note={<p className="text-xs text-muted">Axis from zero; a cash flow below it is a net outflow. Nominal figures, not discounted. A period runs 12 months from the plan&rsquo;s first month and is named by the fiscal year it starts in; &ldquo;now&rdquo; is the plan&rsquo;s first month.</p>}
      >
        <XYChart height={300} margin={{ top: 16, right: 20, bottom: 48, left: 88 }} theme={theme} xScale={{ type: 'band', paddingInner: 0.35, paddingOuter: 0.2 }} yScale={{ type: 'linear', nice: true, zero: true }}>
          <Grid columns={false} numTicks={5} />
          <Axis orientation="bottom" label="Fiscal year of spend" tickFormat={(v) => tick(String(v))} numTicks={periods.length} />
          <Axis orientation="left" labelOffset={54} label={`${currency} k`} numTicks={5} tickFormat={(v) => formatNumber(Number(v), 0)} />
          <BarSeries dataKey="Planned capital" data={capital} xAccessor={(d) => d.label} yAccessor={(d) => d.value} colorAccessor={() => CAPITAL} />
          <LineSeries dataKey="Expected cash flow" data={cash} xAccessor={(d) => d.label} yAccessor={(d) => d.value} colorAccessor={() => CASH} strokeWidth={2} />
          <GlyphSeries dataKey="Expected cash flow points" data={cash} xAccessor={(d) => d.label} yAccessor={(d) => d.value} colorAccessor={() => CASH} size={5} />
          <Tooltip<Pt>
            snapTooltipToDatumX
            renderTooltip={({ tooltipData }) => (
              <div className="text-xs">
                <div>{(tooltipData?.nearestDatum?.datum as Pt | undefined)?.label}</div>
                {Object.entries(tooltipData?.datumByKey ?? {}).filter(([key]) => key !== 'Expected cash flow points').map(([key, v]) => (
                  <div key={key}>{key}: {formatNumber((v.datum as Pt).value, 0, negative)} {currency} k</div>
                ))}
              </div>
            )}
          />
        </XYChart>
      </Figure>
      <div className="overflow-x-auto">
        <table className="data-table" data-testid="programme-periods">
          <caption className="text-left text-xs text-muted">The chart&rsquo;s figures, with each period&rsquo;s budget ({currency} k)</caption>
          <thead>
            <tr><th>Fiscal year of spend</th><th>Months</th><th className="n">Budget ({currency} k)</th><th className="n">Planned capital ({currency} k)</th><th className="n">Expected capital ({currency} k)</th><th className="n">Expected cash flow ({currency} k)</th></tr>
          </thead>
          <tbody>
            {periods.map((p) => (
              <tr key={p.period} data-period={p.period}>
                <td>{p.label}</td>
                <td className="font-mono text-xs">{p.months}</td>
                <td className="n" data-cell="budget">{k(p.budget)}</td>
                <td className="n" data-cell="planned-capital">{k(p.plannedCapital)}</td>
                <td className="n" data-cell="expected-capital">{k(p.expectedCapital)}</td>
                <td className={`n ${p.expectedCashFlow < 0 ? 'text-loss' : ''}`} data-cell="expected-cash-flow">{k(p.expectedCashFlow)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
