'use client';

import { Axis, BarSeries, BarStack, GlyphSeries, Grid, LineSeries, Tooltip, XYChart, buildChartTheme } from '@visx/xychart';
import type { PolicyKey, TruckDetail, TruckResult } from '@/lib/engine/types';
import { POLICIES } from '@/lib/engine/types';
import { formatNumber } from '@/lib/format';
import { bestOtherPolicy, repowerComparison } from '@/lib/plan';
import { POLICY_COLOUR, POLICY_LABEL } from './policy';

const theme = buildChartTheme({
  backgroundColor: '#ffffff',
  colors: ['#b0562b', '#35618f', '#8c837b'],
  gridColor: '#e3e4e1',
  gridColorDark: '#5d646d',
  tickLength: 4,
  svgLabelSmall: { fill: '#5d646d', fontSize: 11 },
  svgLabelBig: { fill: '#15181c', fontSize: 12 },
  // visx draws the bottom axis line 2 px in gridColorDark, which read as a dark data series
  // along the floor of every chart; a thin rule-coloured line is the axis and nothing more.
  xAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
  yAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
  xTickLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
});
const MARGIN = { top: 16, right: 20, bottom: 44, left: 88 };
type Pt = { x: number; y: number };
const px = (d: Pt) => d.x;
const py = (d: Pt) => d.y;

function Legend({ items }: { items: Array<{ label: string; colour: string; shape?: 'line' | 'box' | 'dot' }> }) {
  return (
    <ul className="flex flex-wrap gap-3 text-xs text-muted" aria-label="Legend">
      {items.map((i) => (
        <li key={i.label} className="inline-flex items-center gap-1">
          <span aria-hidden className={i.shape === 'line' ? 'inline-block h-0.5 w-4' : i.shape === 'dot' ? 'inline-block h-2.5 w-2.5 rounded-full' : 'inline-block h-2.5 w-2.5'} style={{ background: i.colour }} />
          {i.label}
        </li>
      ))}
    </ul>
  );
}

// XYChart sizes itself to its parent, so the parent needs a height of its own.
function Figure({ title, children, legend, testId, height }: { title: string; children: React.ReactNode; legend: React.ReactNode; testId: string; height: number }) {
  return (
    <figure className="card p-3" data-testid={testId}>
      <figcaption className="mb-1 text-sm font-semibold">{title}</figcaption>
      {legend}
      <div role="img" aria-label={title} style={{ height }}>{children}</div>
    </figure>
  );
}

/** Cumulative discounted Δ cash flow of repower against the better other policy, payback point marked. */
export function CumulativeDeltaChart({ result, detail, currency }: { result: TruckResult; detail: TruckDetail; currency: string }) {
  const other = bestOtherPolicy(result);
  const c = repowerComparison(result);
  const df = detail.policies.repower.periods.map((p) => p.discountFactor);
  let cum = 0;
  const data: Pt[] = result.options.repower.cashFlows.map((cf, y) => {
    cum += (cf - result.options[other].cashFlows[y]) * df[y];
    return { x: y, y: cum / 1000 };
  });
  const deltas = data.map((d, i) => d.y - (i ? data[i - 1].y : 0));
  const s = deltas.findIndex((d) => Math.abs(d) > 1e-9);
  const pay = c.discountedPaybackYears !== null && s >= 0 ? [{ x: s + c.discountedPaybackYears, y: 0 }] : [];
  return (
    <Figure
      testId="chart-cumulative"
      height={260}
      title={`Cumulative discounted Δ cash flow, repower − ${POLICY_LABEL[other].toLowerCase()} (${currency} k)`}
      legend={<Legend items={[{ label: `Repower − ${POLICY_LABEL[other].toLowerCase()}`, colour: POLICY_COLOUR.repower, shape: 'line' }, { label: pay.length ? `Discounted payback: ${formatNumber(c.discountedPaybackYears, 1)} yr after the spend` : 'No discounted payback', colour: '#2e7650', shape: 'dot' }]} />}
    >
      <XYChart height={260} margin={MARGIN} theme={theme} xScale={{ type: 'linear', nice: true }} yScale={{ type: 'linear', nice: true }}>
        <Grid columns={false} numTicks={5} />
        <Axis orientation="bottom" label="Year" numTicks={Math.min(10, data.length)} />
        <Axis orientation="left" labelOffset={50} label={`${currency} k (discounted)`} numTicks={5} tickFormat={(v) => formatNumber(Number(v), 0, 'minus')} />
        <LineSeries dataKey="Cumulative Δ" data={data} xAccessor={px} yAccessor={py} colorAccessor={() => POLICY_COLOUR.repower} />
        <GlyphSeries dataKey="Years" data={data} xAccessor={px} yAccessor={py} colorAccessor={() => POLICY_COLOUR.repower} size={4} />
        {pay.length ? <GlyphSeries dataKey="Payback" data={pay} xAccessor={px} yAccessor={py} colorAccessor={() => '#2e7650'} size={12} /> : null}
        <Tooltip<Pt>
          snapTooltipToDatumX
          showVerticalCrosshair
          renderTooltip={({ tooltipData }) => {
            const d = tooltipData?.nearestDatum;
            if (!d) return null;
            const datum = d.datum as Pt;
            return d.key === 'Payback' ? <span>Payback at year {formatNumber(datum.x, 2)}</span> : <span>Year {datum.x}: {formatNumber(datum.y, 1, 'parentheses')} {currency} k</span>;
          }}
        />
      </XYChart>
    </Figure>
  );
}

const COST_CATEGORIES = [
  ['fuel', 'Fuel', '#3f4a57'],
  ['carbon', 'Carbon', '#7a8a99'],
  ['lube', 'Lube', '#a7b4bf'],
  ['overhauls', 'Overhauls', '#35618f'],
  ['failures', 'Failures', '#b3261e'],
  ['capital', 'Repower capital', '#b0562b'],
  ['lostMargin', 'Lost margin', '#c9a227'],
] as const;

/** Present value of each cost category, stacked, one bar per policy. */
export function CostStackChart({ detail, currency }: { detail: TruckDetail; currency: string }) {
  const pv = (p: PolicyKey, cat: (typeof COST_CATEGORIES)[number][0]) =>
    Math.max(0, -detail.policies[p].periods.reduce((s, per) => s + per.breakdown[cat] * per.discountFactor, 0)) / 1000;
  type B = { policy: string; value: number; cat: string };
  return (
    <Figure testId="chart-costs" height={280} title={`Present value of costs by category, before tax (${currency} k)`} legend={<Legend items={COST_CATEGORIES.map(([, label, colour]) => ({ label, colour }))} />}>
      <XYChart height={280} margin={MARGIN} theme={theme} xScale={{ type: 'band', paddingInner: 0.4 }} yScale={{ type: 'linear', nice: true }}>
        <Grid columns={false} numTicks={5} />
        <Axis orientation="bottom" label="Policy" />
        <Axis orientation="left" labelOffset={50} label={`${currency} k (present value)`} numTicks={5} tickFormat={(v) => formatNumber(Number(v), 0)} />
        <BarStack>
          {COST_CATEGORIES.map(([cat, label, colour]) => (
            <BarSeries
              key={cat}
              dataKey={label}
              data={POLICIES.map((p) => ({ policy: POLICY_LABEL[p], value: pv(p, cat), cat: label }))}
              xAccessor={(d: B) => d.policy}
              yAccessor={(d: B) => d.value}
              colorAccessor={() => colour}
            />
          ))}
        </BarStack>
        <Tooltip<B>
          renderTooltip={({ tooltipData }) => {
            const d = tooltipData?.nearestDatum?.datum as B | undefined;
            return d ? <span>{d.policy}, {d.cat}: {formatNumber(d.value, 1)} {currency} k</span> : null;
          }}
        />
      </XYChart>
    </Figure>
  );
}

/** Fuel burned each year under each policy. */
export function FuelChart({ detail }: { detail: TruckDetail }) {
  const series = POLICIES.map((p) => ({ p, data: detail.policies[p].periods.filter((x) => x.period > 0).map((x) => ({ x: x.period, y: x.fuelLitres / 1000, lph: x.hours ? x.fuelLitres / x.hours : 0 })) }));
  type F = Pt & { lph: number };
  return (
    <Figure testId="chart-fuel" height={260} title="Fuel burn per policy (kL per year)" legend={<Legend items={POLICIES.map((p) => ({ label: POLICY_LABEL[p], colour: POLICY_COLOUR[p], shape: 'line' as const }))} />}>
      <XYChart height={260} margin={MARGIN} theme={theme} xScale={{ type: 'linear', nice: true }} yScale={{ type: 'linear', nice: true, zero: false }}>
        <Grid columns={false} numTicks={5} />
        <Axis orientation="bottom" label="Year" />
        <Axis orientation="left" labelOffset={50} label="Fuel (kL/yr)" numTicks={5} tickFormat={(v) => formatNumber(Number(v), 0)} />
        {[...series].reverse().map(({ p, data }) => (
          <LineSeries key={p} dataKey={POLICY_LABEL[p]} data={data} xAccessor={px} yAccessor={py} colorAccessor={() => POLICY_COLOUR[p]} strokeDasharray={p === 'keep' ? '4 3' : undefined} />
        ))}
        <Tooltip<F>
          snapTooltipToDatumX
          showVerticalCrosshair
          renderTooltip={({ tooltipData }) => (
            <div className="text-xs">
              <div>Year {(tooltipData?.nearestDatum?.datum as F | undefined)?.x}</div>
              {Object.entries(tooltipData?.datumByKey ?? {}).map(([k, v]) => (
                <div key={k}>{k}: {formatNumber((v.datum as F).y, 1)} kL ({formatNumber((v.datum as F).lph, 1)} L/h)</div>
              ))}
            </div>
          )}
        />
      </XYChart>
    </Figure>
  );
}
