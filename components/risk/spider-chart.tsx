'use client';
import { AxisBottom, AxisLeft } from '@visx/axis';
import { GridRows } from '@visx/grid';
import { Group } from '@visx/group';
import { ParentSize } from '@visx/responsive';
import { scaleLinear } from '@visx/scale';
import { LinePath } from '@visx/shape';
import type { NegativeStyle } from '@/lib/format';
import { driverValue, money, moneyScale } from './format';
import { formatNumber } from '@/lib/format';
import type { DriverView, MetricInput, SpiderLine } from './types';
import { usePost } from './use-post';
import type { RangeMode } from './risk-workbench';

// six distinguishable line colours that are not the policy colours
const COLOURS = ['#15181c', '#6b4c9a', '#2f7f86', '#a0782c', '#7a7f87', '#c04f7a'];
const M = { top: 14, right: 210, bottom: 46, left: 78 };
const LINE = 12;

/** A label broken into lines of at most `width` characters at spaces (a word longer than that is kept whole). */
export function wrapLabel(label: string, width = 30): string[] {
  const lines: string[] = [];
  for (const word of label.split(/\s+/).filter(Boolean)) {
    const last = lines[lines.length - 1];
    if (last !== undefined && last.length + 1 + word.length <= width) lines[lines.length - 1] = `${last} ${word}`;
    else lines.push(word);
  }
  return lines.length ? lines : [label];
}

/** The metric against the percentage change of the drivers that swing it most. */
export function SpiderPanel(props: { base: string; metric: MetricInput; metricLabel: string; driverIds: string[]; drivers: DriverView[]; currency: string; negative: NegativeStyle; rangeMode?: RangeMode }) {
  const realistic = (props.rangeMode ?? 'realistic') === 'realistic';
  const { data, error } = usePost<{ baseValue: number; lines: SpiderLine[] }>(props.driverIds.length ? `${props.base}/spider` : null, {
    metric: props.metric,
    drivers: props.driverIds,
    ...(realistic ? { mode: 'realistic' } : { mode: 'relative', changes: [-0.2, -0.1, 0, 0.1, 0.2] }),
  });
  const byId = new Map(props.drivers.map((d) => [d.id, d]));
  return (
    <section aria-labelledby="spider-title" className="card p-4">
      <h2 id="spider-title" className="text-base font-semibold">How the answer bends</h2>
      <p className="mb-2 text-sm text-muted">{props.metricLabel} as each of the six largest drivers moves {realistic ? 'across its realistic range, from its low (−1) through its value in the case (0) to its high (+1)' : 'from −20 % to +20 % of its value in the case'}.</p>
      {error ? <p role="alert" className="text-sm text-loss">{error.message}</p> : null}
      {data ? (
        <figure aria-label="Spider chart" data-testid="spider-chart">
          <ParentSize debounceTime={50} parentSizeStyles={{ width: "100%", height: 300 }}>
            {({ width }) => (width > 0 ? <Chart {...props} lines={data.lines} byId={byId} width={width} height={300} /> : null)}
          </ParentSize>
        </figure>
      ) : (
        <p className="text-sm text-muted">Computing…</p>
      )}
    </section>
  );
}

function Chart({ lines, byId, width, height, metric, metricLabel, currency, negative, rangeMode }: { lines: SpiderLine[]; byId: Map<string, DriverView>; width: number; height: number } & Parameters<typeof SpiderPanel>[0]) {
  const fleet = metric.kind !== 'truck-delta';
  const realistic = (rangeMode ?? 'realistic') === 'realistic';
  const pos = (t: number) => (realistic ? `${t > 0 ? '+' : ''}${formatNumber(t, 2)}` : `${t > 0 ? '+' : ''}${Math.round(t * 100)} %`);
  const innerW = Math.max(120, width - M.left - M.right);
  const innerH = height - M.top - M.bottom;
  const all = lines.flatMap((l) => l.points.map((p) => p.metric));
  const changes = lines[0]?.points.map((p) => p.change) ?? [0];
  const x = scaleLinear<number>({ domain: [Math.min(...changes), Math.max(...changes)], range: [0, innerW] });
  const y = scaleLinear<number>({ domain: [Math.min(...all), Math.max(...all)], range: [innerH, 0], nice: true });
  // direct labels at the right end, pushed apart where lines end close together
  // (each label as many lines high as it wraps to), then pulled back up when the stack runs off the bottom
  const labelY = new Map<string, number>();
  const wrapped = new Map(lines.map((l) => [l.driver, wrapLabel(byId.get(l.driver)?.label ?? l.driver)]));
  const ends = lines.map((l) => ({ id: l.driver, y: y(l.points[l.points.length - 1].metric), h: (wrapped.get(l.driver)!.length) * LINE })).sort((a, b) => a.y - b.y);
  let bottom = -Infinity;
  for (const e of ends) {
    const top = Math.max(e.y - e.h / 2, bottom + 2);
    labelY.set(e.id, top);
    bottom = top + e.h;
  }
  const overflow = bottom - (innerH + M.bottom - 4);
  if (overflow > 0) for (const e of ends) labelY.set(e.id, Math.max(-M.top + 2, labelY.get(e.id)! - overflow));
  return (
    <svg width={width} height={height} role="img" aria-label={`Spider chart of ${metricLabel}`}>
      <Group left={M.left} top={M.top}>
        <GridRows scale={y} width={innerW} stroke="#e3e4e1" numTicks={5} />
        {lines.map((l, i) => {
          const last = l.points[l.points.length - 1];
          const label = byId.get(l.driver)?.label ?? l.driver;
          return (
            <g key={l.driver}>
              <LinePath data={l.points} x={(p) => x(p.change)} y={(p) => y(p.metric)} stroke={COLOURS[i % COLOURS.length]} strokeWidth={1.5} />
              {l.points.map((p) => (
                <circle key={p.change} cx={x(p.change)} cy={y(p.metric)} r={2.5} fill={COLOURS[i % COLOURS.length]}>
                  <title>{`${label} ${pos(p.change)} (${driverValue(byId.get(l.driver), p.value)}): ${money(p.metric, fleet, negative)} ${currency} ${moneyScale(fleet).suffix}`}</title>
                </circle>
              ))}
              <text x={x(last.change) + 6} y={labelY.get(l.driver)} fontSize={11} fill={COLOURS[i % COLOURS.length]} data-testid="spider-label">
                <title>{label}</title>
                {wrapped.get(l.driver)!.map((line, k) => <tspan key={k} x={x(last.change) + 6} dy={k === 0 ? '0.9em' : LINE}>{line}</tspan>)}
              </text>
            </g>
          );
        })}
        <AxisLeft
          scale={y}
          numTicks={5}
          tickFormat={(v) => money(Number(v), fleet, negative)}
          stroke="#5d646d"
          tickStroke="#5d646d"
          tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'end', dx: -4, dy: '0.33em' }}
          label={`${currency} ${moneyScale(fleet).suffix}`}
          labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }}
          labelOffset={48}
        />
        <AxisBottom
          top={innerH}
          scale={x}
          numTicks={changes.length}
          tickFormat={(v) => pos(Number(v))}
          stroke="#5d646d"
          tickStroke="#5d646d"
          tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'middle' }}
          label={realistic ? 'Position in the driver\'s realistic range (−1 low, 0 the case, +1 high)' : 'Change of the driver from its value in the case (%)'}
          labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }}
          labelOffset={14}
        />
      </Group>
    </svg>
  );
}
