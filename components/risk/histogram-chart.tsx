'use client';
import { AxisBottom, AxisLeft } from '@visx/axis';
import { Group } from '@visx/group';
import { ParentSize } from '@visx/responsive';
import { scaleLinear } from '@visx/scale';
import { Bar, Line, LinePath } from '@visx/shape';
import type { NegativeStyle } from '@/lib/format';
import { money, moneyScale } from './format';
import type { Summary } from './types';

const M = { top: 22, right: 20, bottom: 46, left: 64 };

/** The deterministic figure of the case marked on the histogram (its value and label). */
export interface HeadlineMark {
  value: number;
  label: string;
}

/** Histogram of a Monte Carlo metric with P10, P50 and P90 marked, zero in red when in range, and the case's headline figure. */
export function HistogramChart(props: { summary: Summary; fleet: boolean; currency: string; label: string; negative: NegativeStyle; headline?: HeadlineMark }) {
  return (
    <figure aria-label="Monte Carlo histogram" data-testid="mc-histogram">
      <ParentSize debounceTime={50} parentSizeStyles={{ width: "100%", height: 280 }}>{({ width }) => (width > 0 ? <Histogram {...props} width={width} height={280} /> : null)}</ParentSize>
    </figure>
  );
}

function Histogram({ summary: s, fleet, currency, label, negative, headline, width, height }: Parameters<typeof HistogramChart>[0] & { width: number; height: number }) {
  const innerW = Math.max(100, width - M.left - M.right);
  const innerH = height - M.top - M.bottom;
  const h = headline && Number.isFinite(headline.value) ? headline : undefined;
  // the axis reaches the headline even when no iteration comes near it
  const from = Math.min(s.histogram[0]?.from ?? s.min, h ? h.value : Infinity);
  const to = Math.max(s.histogram[s.histogram.length - 1]?.to ?? s.max, h ? h.value : -Infinity);
  const x = scaleLinear<number>({ domain: [from, to === from ? from + 1 : to], range: [0, innerW] });
  const y = scaleLinear<number>({ domain: [0, Math.max(1, ...s.histogram.map((b) => b.count))], range: [innerH, 0], nice: true });
  const unit = `${currency} ${moneyScale(fleet).suffix}`;
  const marks: [string, number][] = [['P10', s.p10], ['P50', s.p50], ['P90', s.p90]];
  return (
    <svg width={width} height={height} role="img" aria-label={`Histogram of ${label}`}>
      <Group left={M.left} top={M.top}>
        {s.histogram.map((b, i) => (
          <Bar key={i} x={x(b.from) + 0.5} y={y(b.count)} width={Math.max(1, x(b.to) - x(b.from) - 1)} height={innerH - y(b.count)} fill={b.to <= 0 ? '#d9a19c' : '#9aa5b4'}>
            <title>{`${money(b.from, fleet, negative)} to ${money(b.to, fleet, negative)} ${unit}: ${b.count} iterations`}</title>
          </Bar>
        ))}
        {from < 0 && to > 0 ? <Line from={{ x: x(0), y: 0 }} to={{ x: x(0), y: innerH }} stroke="#b3261e" strokeWidth={1} strokeDasharray="3 3" /> : null}
        {marks.map(([name, v]) => (
          <g key={name} data-mark={name}>
            <Line from={{ x: x(v), y: -4 }} to={{ x: x(v), y: innerH }} stroke="#15181c" strokeWidth={name === 'P50' ? 1.5 : 1} strokeDasharray={name === 'P50' ? undefined : '4 3'} />
            <text x={x(v)} y={-8} textAnchor="middle" fontSize={11} fill="#15181c">{`${name} ${money(v, fleet, negative)}`}</text>
          </g>
        ))}
        {h ? (
          <g data-mark="headline" data-testid="mc-headline-mark">
            <Line from={{ x: x(h.value), y: 0 }} to={{ x: x(h.value), y: innerH }} stroke="#b0562b" strokeWidth={2} />
            <text
              x={x(h.value) + (x(h.value) > innerW / 2 ? -6 : 6)}
              y={14}
              textAnchor={x(h.value) > innerW / 2 ? 'end' : 'start'}
              fontSize={11}
              fontWeight={600}
              fill="#b0562b"
              stroke="#f7f7f5"
              strokeWidth={3}
              paintOrder="stroke"
            >
              {`${h.label} ${money(h.value, fleet, negative)}`}
            </text>
          </g>
        ) : null}
        <AxisLeft scale={y} numTicks={4} stroke="#5d646d" tickStroke="#5d646d" tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'end', dx: -4, dy: '0.33em' }} label="Iterations" labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }} labelOffset={36} />
        <AxisBottom top={innerH} scale={x} numTicks={Math.max(3, Math.floor(innerW / 90))} tickFormat={(v) => money(Number(v), fleet, negative)} stroke="#5d646d" tickStroke="#5d646d" tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'middle' }} label={`${label} (${unit})`} labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }} labelOffset={14} />
      </Group>
    </svg>
  );
}

/** The running mean against iterations: flat at the right means enough iterations. */
export function RunningMeanChart({ summary, fleet, currency, negative }: { summary: Summary; fleet: boolean; currency: string; negative: NegativeStyle }) {
  return (
    <figure aria-label="Running mean" data-testid="mc-running-mean">
      <ParentSize debounceTime={50} parentSizeStyles={{ width: "100%", height: 160 }}>
        {({ width }) => {
          if (width <= 0) return null;
          const h = 160;
          const innerW = Math.max(100, width - M.left - M.right);
          const innerH = h - 14 - M.bottom;
          const pts = summary.runningMean;
          const x = scaleLinear<number>({ domain: [0, pts[pts.length - 1]?.[0] ?? 1], range: [0, innerW] });
          const y = scaleLinear<number>({ domain: [Math.min(...pts.map((p) => p[1])), Math.max(...pts.map((p) => p[1]))], range: [innerH, 0], nice: true });
          return (
            <svg width={width} height={h} role="img" aria-label="Running mean against iterations">
              <Group left={M.left} top={14}>
                <LinePath data={pts} x={(p) => x(p[0])} y={(p) => y(p[1])} stroke="#15181c" strokeWidth={1.25} />
                <AxisLeft scale={y} numTicks={3} tickFormat={(v) => money(Number(v), fleet, negative)} stroke="#5d646d" tickStroke="#5d646d" tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'end', dx: -4, dy: '0.33em' }} label={`Mean (${currency} ${moneyScale(fleet).suffix})`} labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }} labelOffset={40} />
                <AxisBottom top={innerH} scale={x} numTicks={5} tickFormat={(v) => Number(v).toLocaleString('en-US')} stroke="#5d646d" tickStroke="#5d646d" tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'middle' }} label="Iterations" labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }} labelOffset={14} />
              </Group>
            </svg>
          );
        }}
      </ParentSize>
    </figure>
  );
}
