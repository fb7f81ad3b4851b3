'use client';

import { useState } from 'react';
import { Axis, GlyphSeries, Grid, LineSeries, Tooltip, XYChart, buildChartTheme } from '@visx/xychart';
import type { FleetYear, FleetYearFigures } from '@/lib/cases/fleet-years';
import { formatNumber } from '@/lib/format';
import { Figure, Legend } from './charts';
import { POLICY_COLOUR } from './policy';

const theme = buildChartTheme({
  backgroundColor: '#ffffff',
  colors: ['#b0562b', '#35618f'],
  gridColor: '#e3e4e1',
  gridColorDark: '#5d646d',
  tickLength: 4,
  svgLabelSmall: { fill: '#5d646d', fontSize: 11 },
  svgLabelBig: { fill: '#15181c', fontSize: 12 },
  xAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
  yAxisLineStyles: { stroke: '#e3e4e1', strokeWidth: 1 },
});

type Measure = { key: string; label: string; unit: (c: string) => string; value: (f: FleetYearFigures) => number | null; digits: number };
const MEASURES: Measure[] = [
  { key: 'capital', label: 'Capital', unit: (c) => `${c} k`, value: (f) => f.capital / 1000, digits: 0 },
  { key: 'cash', label: 'Cash flow', unit: (c) => `${c} k, after tax`, value: (f) => f.cashFlow / 1000, digits: 0 },
  { key: 'fuel', label: 'Fuel', unit: () => 'kL', value: (f) => f.fuelLitres / 1000, digits: 0 },
  { key: 'co2', label: 'CO2', unit: () => 't', value: (f) => f.co2Tonnes, digits: 0 },
  { key: 'cpt', label: 'Cost per tonne', unit: (c) => `${c}/t, before tax`, value: (f) => f.costPerTonne, digits: 3 },
];

type Pt = { x: number; y: number };

/** The fleet over the years: the best mix (each truck on its best policy) against rebuilding every engine. */
export function FleetYearsChart({ years, currency }: { years: FleetYear[]; currency: string }) {
  const [key, setKey] = useState('cash');
  const m = MEASURES.find((x) => x.key === key)!;
  const series = (which: 'best' | 'rebuild'): Pt[] => years.flatMap((y) => {
    const v = m.value(y[which]);
    return v === null || !Number.isFinite(v) ? [] : [{ x: y.year, y: v }];
  });
  const best = series('best');
  const rebuild = series('rebuild');
  const part = years.filter((y) => y.partYear).map((y) => y.year);
  const title = `Fleet by year: ${m.label.toLowerCase()} (${m.unit(currency)}), best mix against rebuilding every engine`;
  return (
    <section aria-label="Fleet by year" className="space-y-2">
      <div role="group" aria-label="Fleet figure" className="flex flex-wrap gap-1">
        {MEASURES.map((x) => (
          <button key={x.key} type="button" aria-pressed={x.key === key} className={`btn py-0.5 ${x.key === key ? 'border-ink font-semibold' : ''}`} onClick={() => setKey(x.key)}>{x.label}</button>
        ))}
      </div>
      <Figure
        testId="chart-fleet-years"
        height={280}
        title={title}
        legend={<Legend items={[{ label: 'Best mix (each truck on its best policy)', colour: POLICY_COLOUR.repower, shape: 'line' }, { label: 'Rebuild every engine (dashed)', colour: POLICY_COLOUR.rebuild, shape: 'dashed' }]} />}
        note={<p className="text-xs text-muted">Axis from zero; year 0 is now. Nominal figures, not discounted. Trucks leave the fleet at the end of their own horizons{part.length ? `; year${part.length > 1 ? 's' : ''} ${part.join(', ')} include a truck's part year` : ''}. Cost per tonne: fuel, carbon, lube, overhauls, repairs, repower capital and lost margin of the year over the tonnes hauled.</p>}
      >
        <XYChart height={280} margin={{ top: 16, right: 20, bottom: 44, left: 88 }} theme={theme} xScale={{ type: 'linear', nice: true }} yScale={{ type: 'linear', nice: true, zero: true }}>
          <Grid columns={false} numTicks={5} />
          <Axis orientation="bottom" label="Year" numTicks={Math.min(12, years.length)} tickFormat={(v) => formatNumber(Number(v), 0)} />
          <Axis orientation="left" labelOffset={54} label={m.unit(currency)} numTicks={5} tickFormat={(v) => formatNumber(Number(v), m.digits === 3 ? 2 : 0)} />
          <LineSeries dataKey="Rebuild every engine" data={rebuild} xAccessor={(d) => d.x} yAccessor={(d) => d.y} colorAccessor={() => POLICY_COLOUR.rebuild} strokeDasharray="6 4" strokeWidth={2} />
          <LineSeries dataKey="Best mix" data={best} xAccessor={(d) => d.x} yAccessor={(d) => d.y} colorAccessor={() => POLICY_COLOUR.repower} strokeWidth={2} />
          <GlyphSeries dataKey="Best mix points" data={best} xAccessor={(d) => d.x} yAccessor={(d) => d.y} colorAccessor={() => POLICY_COLOUR.repower} size={4} />
          <Tooltip<Pt>
            snapTooltipToDatumX
            showVerticalCrosshair
            renderTooltip={({ tooltipData }) => (
              <div className="text-xs">
                <div>Year {(tooltipData?.nearestDatum?.datum as Pt | undefined)?.x}</div>
                {Object.entries(tooltipData?.datumByKey ?? {}).filter(([k]) => k !== 'Best mix points').map(([k, v]) => (
                  <div key={k}>{k}: {formatNumber((v.datum as Pt).y, m.digits)} {m.unit(currency)}</div>
                ))}
              </div>
            )}
          />
        </XYChart>
      </Figure>
    </section>
  );
}
