'use client';

import { useContext } from 'react';
import { Axis, BarSeries, BarStack, DataContext, GlyphSeries, Grid, LineSeries, Tooltip, XYChart, buildChartTheme } from '@visx/xychart';
import type { PolicyKey, TruckDetail, TruckResult } from '@/lib/engine/types';
import { POLICIES } from '@/lib/engine/types';
import { formatNumber } from '@/lib/format';
import { paybackHold, paybackWarning } from '@/lib/cases/payback';
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

export type LegendItem = { label: string; colour: string; shape?: 'line' | 'dashed' | 'wide' | 'box' | 'dot' | 'band' };

export function Legend({ items }: { items: LegendItem[] }) {
  return (
    <ul className="flex flex-wrap gap-3 text-xs text-muted" aria-label="Legend">
      {items.map((i) => (
        <li key={i.label} className="inline-flex items-center gap-1">
          {i.shape === 'dashed' ? (
            <span aria-hidden className="inline-block w-5 border-t-2 border-dashed" style={{ borderColor: i.colour }} />
          ) : (
            <span
              aria-hidden
              className={i.shape === 'line' ? 'inline-block h-0.5 w-5' : i.shape === 'wide' ? 'inline-block h-1.5 w-5 opacity-50' : i.shape === 'dot' ? 'inline-block h-2.5 w-2.5 rounded-full' : i.shape === 'band' ? 'inline-block h-3 w-4 opacity-60' : 'inline-block h-2.5 w-2.5'}
              style={{ background: i.colour }}
            />
          )}
          {i.label}
        </li>
      ))}
    </ul>
  );
}

/** The last year a truck runs, when it is a part year: its period and the share of a full year's hours. */
export type PartYear = { period: number; share: number } | null;

export function partYearOf(detail: TruckDetail, annualHours: number): PartYear {
  const last = detail.policies.rebuild.periods[detail.policies.rebuild.periods.length - 1];
  if (!last || last.period === 0 || !(annualHours > 0) || last.hours >= annualHours * (1 - 1e-9)) return null;
  return { period: last.period, share: last.hours / annualHours };
}

const PART_FILL = '#c9ccc6';

/**
 * Shades x from `from` to `to` (data units) across the plot, with a label at the top;
 * reads the chart's scales from XYChart's context.
 */
function Band({ from, to, label, fill, testId }: { from: number; to: number; label: string; fill: string; testId: string }) {
  const { xScale, innerHeight, margin, innerWidth } = useContext(DataContext);
  if (!xScale || !margin || !innerHeight) return null;
  const sx = xScale as unknown as (v: number) => number;
  const left = Math.max(margin.left, sx(from));
  const right = Math.min(margin.left + (innerWidth ?? 0), sx(to));
  if (!(right > left)) return null;
  return (
    <g data-testid={testId} pointerEvents="none">
      <rect x={left} y={margin.top} width={right - left} height={innerHeight} fill={fill} opacity={0.35} />
      <text x={(left + right) / 2} y={margin.top + 10} textAnchor="middle" fontSize={10} fill="#3f4a57">{label}</text>
    </g>
  );
}

/** The part-year band: half a step either side of the last year's point, labelled with its share. */
export function PartYearBand({ partYear }: { partYear: PartYear }) {
  if (!partYear) return null;
  return <Band from={partYear.period - 0.5} to={partYear.period + 0.5} fill={PART_FILL} label={`part year (${Math.round(partYear.share * 100)} %)`} testId="part-year-band" />;
}

export function partYearLegend(partYear: PartYear): LegendItem[] {
  return partYear ? [{ label: `Year ${partYear.period} is a part year (${Math.round(partYear.share * 100)} % of a year's hours): a lower figure there is not a fall`, colour: PART_FILL, shape: 'band' }] : [];
}

// XYChart sizes itself to its parent, so the parent needs a height of its own.
export function Figure({ title, children, legend, testId, height, note }: { title: string; children: React.ReactNode; legend: React.ReactNode; testId: string; height: number; note?: React.ReactNode }) {
  return (
    <figure className="card p-3" data-testid={testId}>
      <figcaption className="mb-1 text-sm font-semibold">{title}</figcaption>
      {legend}
      {note}
      <div role="img" aria-label={title} style={{ height }}>{children}</div>
    </figure>
  );
}

/**
 * Cumulative discounted Δ cash flow of repower against the better other policy, payback point marked;
 * a payback after which the curve goes below zero again is flagged in words and shaded on the chart.
 */
export function CumulativeDeltaChart({ result, detail, currency, partYear }: { result: TruckResult; detail: TruckDetail; currency: string; partYear: PartYear }) {
  const other = bestOtherPolicy(result);
  const c = repowerComparison(result);
  const df = detail.policies.repower.periods.map((p) => p.discountFactor);
  const discounted = result.options.repower.cashFlows.map((cf, y) => (cf - result.options[other].cashFlows[y]) * df[y]);
  let cum = 0;
  const data: Pt[] = discounted.map((d, y) => {
    cum += d;
    return { x: y, y: cum / 1000 };
  });
  const hold = paybackHold(discounted);
  const warning = paybackWarning(hold);
  const pay = hold.kind === 'holds' || hold.kind === 'falls-back' ? [{ x: hold.start + hold.at, y: 0 }] : [];
  const payLabel =
    hold.kind === 'no-investment'
      ? 'No discounted payback: no investment (repowering spends nothing more)'
      : hold.kind === 'never'
        ? 'No discounted payback within the horizon'
        : `Discounted payback: ${formatNumber(c.discountedPaybackYears, 1)} yr after the spend${hold.kind === 'falls-back' ? ' — does not hold' : ''}`;
  return (
    <Figure
      testId="chart-cumulative"
      height={260}
      title={`Cumulative discounted Δ cash flow, repower − ${POLICY_LABEL[other].toLowerCase()} (${currency} k)`}
      legend={
        <Legend
          items={[
            { label: `Repower − ${POLICY_LABEL[other].toLowerCase()}`, colour: POLICY_COLOUR.repower, shape: 'line' },
            { label: payLabel, colour: hold.kind === 'falls-back' ? '#b3261e' : '#2e7650', shape: 'dot' },
            ...(hold.kind === 'falls-back' ? [{ label: 'Below zero again after the payback', colour: '#f2c4c0', shape: 'band' as const }] : []),
            ...partYearLegend(partYear),
          ]}
        />
      }
      note={warning ? <p role="note" className="my-1 rounded border border-loss/40 bg-loss/5 px-2 py-1 text-xs text-loss" data-testid="payback-warning">{warning} (discounted): the payback does not hold.</p> : null}
    >
      <XYChart height={260} margin={MARGIN} theme={theme} xScale={{ type: 'linear', nice: true }} yScale={{ type: 'linear', nice: true, zero: true }}>
        <Grid columns={false} numTicks={5} />
        <PartYearBand partYear={partYear} />
        {hold.kind === 'falls-back' ? hold.below.map((r) => <Band key={r.from} from={r.from - 0.5} to={r.to + 0.5} fill="#f2c4c0" label="below zero again" testId="payback-dip" />) : null}
        <Axis orientation="bottom" label="Year" numTicks={Math.min(10, data.length)} />
        <Axis orientation="left" labelOffset={50} label={`${currency} k (discounted)`} numTicks={5} tickFormat={(v) => formatNumber(Number(v), 0, 'minus')} />
        <LineSeries dataKey="Cumulative Δ" data={data} xAccessor={px} yAccessor={py} colorAccessor={() => POLICY_COLOUR.repower} />
        <GlyphSeries dataKey="Years" data={data} xAccessor={px} yAccessor={py} colorAccessor={() => POLICY_COLOUR.repower} size={4} />
        {pay.length ? <GlyphSeries dataKey="Payback" data={pay} xAccessor={px} yAccessor={py} colorAccessor={() => (hold.kind === 'falls-back' ? '#b3261e' : '#2e7650')} size={12} /> : null}
        <Tooltip<Pt>
          snapTooltipToDatumX
          showVerticalCrosshair
          renderTooltip={({ tooltipData }) => {
            const d = tooltipData?.nearestDatum;
            if (!d) return null;
            const datum = d.datum as Pt;
            return d.key === 'Payback' ? <span>Payback at year {formatNumber(datum.x, 2)}{hold.kind === 'falls-back' ? ' (does not hold)' : ''}</span> : <span>Year {datum.x}: {formatNumber(datum.y, 1, 'parentheses')} {currency} k</span>;
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
      <XYChart height={280} margin={MARGIN} theme={theme} xScale={{ type: 'band', paddingInner: 0.4 }} yScale={{ type: 'linear', nice: true, zero: true }}>
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

/**
 * Fuel burned each year under each policy. The axis starts at zero (a 3 % saving must look like 3 %);
 * rebuild is drawn wide and pale underneath, keep dashed on top, so lines that coincide both show;
 * the last year, when it is a part year, is shaded and labelled.
 */
export function FuelChart({ detail, partYear }: { detail: TruckDetail; partYear: PartYear }) {
  const series = POLICIES.map((p) => ({ p, data: detail.policies[p].periods.filter((x) => x.period > 0).map((x) => ({ x: x.period, y: x.fuelLitres / 1000, lph: x.hours ? x.fuelLitres / x.hours : 0 })) }));
  type F = Pt & { lph: number };
  // drawing order: rebuild (wide, underneath), repower, keep (dashed, on top)
  const order: PolicyKey[] = ['rebuild', 'repower', 'keep'];
  const style: Record<PolicyKey, { width: number; dash?: string; opacity: number }> = {
    rebuild: { width: 5, opacity: 0.45 },
    repower: { width: 2, opacity: 1 },
    keep: { width: 2, dash: '6 4', opacity: 1 },
  };
  return (
    <Figure
      testId="chart-fuel"
      height={260}
      title="Fuel burn per policy (kL per year)"
      legend={
        <Legend
          items={[
            { label: `${POLICY_LABEL.keep} (dashed, drawn on top)`, colour: POLICY_COLOUR.keep, shape: 'dashed' },
            { label: `${POLICY_LABEL.rebuild} (wide, underneath)`, colour: POLICY_COLOUR.rebuild, shape: 'wide' },
            { label: POLICY_LABEL.repower, colour: POLICY_COLOUR.repower, shape: 'line' },
            ...partYearLegend(partYear),
          ]}
        />
      }
      note={<p className="text-xs text-muted">Axis from zero. Where keep and rebuild burn the same, the dashed line runs inside the wide one.</p>}
    >
      <XYChart height={260} margin={MARGIN} theme={theme} xScale={{ type: 'linear', nice: true }} yScale={{ type: 'linear', nice: true, zero: true }}>
        <Grid columns={false} numTicks={5} />
        <PartYearBand partYear={partYear} />
        <Axis orientation="bottom" label="Year" />
        <Axis orientation="left" labelOffset={50} label="Fuel (kL/yr)" numTicks={5} tickFormat={(v) => formatNumber(Number(v), 0)} />
        {order.map((p) => {
          const { data } = series.find((x) => x.p === p)!;
          return (
            <LineSeries
              key={p}
              dataKey={POLICY_LABEL[p]}
              data={data}
              xAccessor={px}
              yAccessor={py}
              colorAccessor={() => POLICY_COLOUR[p]}
              strokeWidth={style[p].width}
              strokeDasharray={style[p].dash}
              strokeOpacity={style[p].opacity}
            />
          );
        })}
        <Tooltip<F>
          snapTooltipToDatumX
          showVerticalCrosshair
          renderTooltip={({ tooltipData }) => (
            <div className="text-xs">
              <div>Year {(tooltipData?.nearestDatum?.datum as F | undefined)?.x}{partYear && (tooltipData?.nearestDatum?.datum as F | undefined)?.x === partYear.period ? ' (part year)' : ''}</div>
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
