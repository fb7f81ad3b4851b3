'use client';
import { AxisBottom, AxisLeft } from '@visx/axis';
import { GridRows } from '@visx/grid';
import { Group } from '@visx/group';
import { ParentSize } from '@visx/responsive';
import { scaleLinear } from '@visx/scale';
import { Line, LinePath } from '@visx/shape';
import { formatMoney, formatNumber } from '@/lib/format';

const M = { top: 16, right: 24, bottom: 44, left: 72 };
const HEIGHT = 280;
const CURVE = '#15181c';
const CURRENT = '#a0782c';
const OPTIMUM = '#2f7f86';

export type CostRateChartProps = {
  curve: { hours: number; costPerHour: number }[];
  currentHours: number;
  currentCostPerHour: number;
  optimumHours: number | null;
  optimumCostPerHour: number;
  runToFailureCostPerHour: number;
  currency: string;
  engineKey: string;
};

/**
 * Cost per operating hour against planned life (y from zero), the current
 * planned life and the optimum marked; near zero hours the rate climbs without
 * bound, so the chart stops at 1.6 times the larger of the current and the
 * run-to-failure rates and the curve enters it from above.
 */
export function CostRateChart(props: CostRateChartProps) {
  return (
    <figure aria-label={`Cost per operating hour against planned life, ${props.engineKey}`} data-testid="cost-rate-chart">
      <ParentSize debounceTime={50} parentSizeStyles={{ width: '100%', height: HEIGHT }}>
        {({ width }) => (width > 0 ? <Chart {...props} width={width} /> : null)}
      </ParentSize>
      <figcaption className="mt-1 flex flex-wrap gap-4 text-xs text-muted">
        <span><span aria-hidden="true" style={{ color: CURVE }}>━</span> cost per operating hour</span>
        <span><span aria-hidden="true" style={{ color: CURRENT }}>┆</span> current planned life</span>
        {props.optimumHours !== null ? <span><span aria-hidden="true" style={{ color: OPTIMUM }}>┃</span> recommended life (lowest cost per hour)</span> : null}
        <span><span aria-hidden="true">╌</span> run to failure</span>
      </figcaption>
    </figure>
  );
}

function Chart({ curve, currentHours, currentCostPerHour, optimumHours, optimumCostPerHour, runToFailureCostPerHour, currency, width }: CostRateChartProps & { width: number }) {
  const innerW = Math.max(120, width - M.left - M.right);
  const innerH = HEIGHT - M.top - M.bottom;
  const yMax = 1.6 * Math.max(currentCostPerHour, runToFailureCostPerHour, optimumCostPerHour);
  const xMax = curve[curve.length - 1]?.hours ?? currentHours * 2;
  const x = scaleLinear<number>({ domain: [0, xMax], range: [0, innerW] });
  const y = scaleLinear<number>({ domain: [0, yMax], range: [innerH, 0], nice: true });
  const shown = curve.filter((p) => p.costPerHour <= y.domain()[1]);
  const money = (v: number) => formatMoney(v, { digits: 2 });
  return (
    <svg width={width} height={HEIGHT} role="img" aria-label={`Cost per operating hour (${currency}/h) against planned life (h)`}>
      <Group left={M.left} top={M.top}>
        <GridRows scale={y} width={innerW} stroke="#e3e4e1" numTicks={5} />
        <Line from={{ x: 0, y: y(runToFailureCostPerHour) }} to={{ x: innerW, y: y(runToFailureCostPerHour) }} stroke="#7a7f87" strokeDasharray="6 4" strokeWidth={1} />
        <text x={innerW - 4} y={y(runToFailureCostPerHour) - 4} fontSize={11} textAnchor="end" fill="#5d646d">run to failure {money(runToFailureCostPerHour)}</text>
        <LinePath data={shown} x={(p) => x(p.hours)} y={(p) => y(p.costPerHour)} stroke={CURVE} strokeWidth={1.75} />
        <g data-testid="mark-current">
          <Line from={{ x: x(currentHours), y: 0 }} to={{ x: x(currentHours), y: innerH }} stroke={CURRENT} strokeDasharray="3 3" strokeWidth={1.5} />
          <circle cx={x(currentHours)} cy={y(Math.min(currentCostPerHour, y.domain()[1]))} r={4} fill={CURRENT}>
            <title>{`Current planned life ${formatNumber(currentHours)} h: ${money(currentCostPerHour)} ${currency}/h`}</title>
          </circle>
          <text x={x(currentHours) + 5} y={12} fontSize={11} fill={CURRENT}>current {formatNumber(currentHours)} h</text>
        </g>
        {optimumHours !== null ? (
          <g data-testid="mark-optimum">
            <Line from={{ x: x(optimumHours), y: 0 }} to={{ x: x(optimumHours), y: innerH }} stroke={OPTIMUM} strokeWidth={1.5} />
            <circle cx={x(optimumHours)} cy={y(optimumCostPerHour)} r={4} fill={OPTIMUM}>
              <title>{`Recommended life ${formatNumber(optimumHours)} h: ${money(optimumCostPerHour)} ${currency}/h`}</title>
            </circle>
            <text x={x(optimumHours) + 5} y={26} fontSize={11} fill={OPTIMUM}>recommended {formatNumber(optimumHours)} h</text>
          </g>
        ) : null}
        <AxisLeft
          scale={y}
          numTicks={5}
          tickFormat={(v) => formatNumber(Number(v))}
          stroke="#5d646d"
          tickStroke="#5d646d"
          tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'end', dx: -4, dy: '0.33em' }}
          label={`${currency} per operating hour`}
          labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }}
          labelOffset={44}
        />
        <AxisBottom
          top={innerH}
          scale={x}
          numTicks={6}
          tickFormat={(v) => formatNumber(Number(v))}
          stroke="#5d646d"
          tickStroke="#5d646d"
          tickLabelProps={{ fontSize: 11, fill: '#5d646d', textAnchor: 'middle' }}
          label="Planned life (operating hours between overhauls)"
          labelProps={{ fontSize: 12, fill: '#15181c', textAnchor: 'middle' }}
          labelOffset={16}
        />
      </Group>
    </svg>
  );
}
