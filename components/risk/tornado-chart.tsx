'use client';
import { AxisBottom } from '@visx/axis';
import { Group } from '@visx/group';
import { ParentSize } from '@visx/responsive';
import { scaleBand, scaleLinear } from '@visx/scale';
import { Bar, Line } from '@visx/shape';
import type { NegativeStyle } from '@/lib/format';
import { money, moneyScale } from './format';
import type { DriverView, TornadoRow } from './types';

const LOW = '#9aa5b4';
const HIGH = '#3d4654';
const LEFT = 230;

/** Horizontal bars around the base metric: the light part is the driver at its low value, the dark part at its high value. */
export function TornadoChart(props: {
  rows: TornadoRow[];
  baseValue: number;
  drivers: Map<string, DriverView>;
  fleet: boolean;
  currency: string;
  metricLabel: string;
  negative: NegativeStyle;
}) {
  const rows = props.rows.slice(0, 12);
  const height = 40 + rows.length * 26 + 44;
  return (
    <figure aria-label="Tornado chart" data-testid="tornado-chart">
      <ParentSize debounceTime={50} parentSizeStyles={{ width: "100%", height }}>{({ width }) => (width > 0 ? <Chart {...props} rows={rows} width={width} height={height} /> : null)}</ParentSize>
      <figcaption className="mt-1 flex gap-4 text-xs text-muted">
        <span><span className="mr-1 inline-block h-2.5 w-2.5 align-middle" style={{ background: LOW }} />driver at its low value</span>
        <span><span className="mr-1 inline-block h-2.5 w-2.5 align-middle" style={{ background: HIGH }} />driver at its high value</span>
        <span>vertical line: the case as it stands ({money(props.baseValue, props.fleet, props.negative)} {props.currency} {moneyScale(props.fleet).suffix})</span>
      </figcaption>
    </figure>
  );
}

function Chart({ rows, baseValue, drivers, fleet, currency, metricLabel, negative, width, height }: Parameters<typeof TornadoChart>[0] & { width: number; height: number }) {
  const innerW = Math.max(100, width - LEFT - 24);
  const innerH = rows.length * 26;
  const values = rows.flatMap((r) => [r.metricLow, r.metricHigh]).concat(baseValue);
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const pad = (hi - lo) * 0.05 || Math.abs(baseValue) * 0.05 || 1;
  const x = scaleLinear<number>({ domain: [lo - pad, hi + pad], range: [0, innerW], nice: true });
  const y = scaleBand<string>({ domain: rows.map((r) => r.driver), range: [0, innerH], padding: 0.25 });
  const div = moneyScale(fleet).scale === 'M' ? 1e6 : 1e3;
  return (
    <svg width={width} height={height} role="img" aria-label={`Tornado of ${metricLabel}`}>
      <Group left={LEFT} top={16}>
        {rows.map((r) => {
          const yy = y(r.driver) ?? 0;
          const bh = y.bandwidth();
          const seg = (v: number, fill: string, end: string) => (
            <Bar x={Math.min(x(baseValue), x(v))} y={yy} width={Math.max(1, Math.abs(x(v) - x(baseValue)))} height={bh} fill={fill}>
              <title>{`${drivers.get(r.driver)?.label ?? r.driver} at ${end}: ${money(v, fleet, negative)} ${currency} ${moneyScale(fleet).suffix}`}</title>
            </Bar>
          );
          return (
            <g key={r.driver} data-driver={r.driver}>
              <text x={-8} y={yy + bh / 2} dy="0.33em" textAnchor="end" fontSize={12} fill="#15181c">
                {drivers.get(r.driver)?.label ?? r.driver}
              </text>
              {seg(r.metricLow, LOW, 'low')}
              {seg(r.metricHigh, HIGH, 'high')}
            </g>
          );
        })}
        <Line from={{ x: x(baseValue), y: -6 }} to={{ x: x(baseValue), y: innerH + 2 }} stroke="#15181c" strokeWidth={1} />
        {lo < 0 && hi > 0 ? <Line from={{ x: x(0), y: -6 }} to={{ x: x(0), y: innerH + 2 }} stroke="#b3261e" strokeDasharray="3 3" strokeWidth={1} /> : null}
        <AxisBottom
          top={innerH + 4}
          scale={x}
          numTicks={Math.max(3, Math.floor(innerW / 90))}
          tickFormat={(v) => money(Number(v), fleet, negative)}
          stroke="#5d646d"
          tickStroke="#5d646d"
          tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'middle' }}
          label={`${metricLabel} (${currency} ${moneyScale(fleet).suffix})`}
          labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }}
          labelOffset={14}
        />
      </Group>
      <desc>{`Scale: 1 unit = ${div.toLocaleString('en-US')} ${currency}`}</desc>
    </svg>
  );
}
