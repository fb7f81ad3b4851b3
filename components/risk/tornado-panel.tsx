'use client';
import { useEffect, useState } from 'react';
import type { NegativeStyle } from '@/lib/format';
import { driverValue, fromInput, money, moneyScale, toInput } from './format';
import { TornadoChart } from './tornado-chart';
import type { DriverView, MetricInput, TornadoRow } from './types';
import { usePost } from './use-post';
import type { RangeMode } from './risk-workbench';

type Ranges = Record<string, { low: number; high: number }>;

/** The tornado and its table; each driver's low and high can be typed over, and the chart redraws. */
export function TornadoPanel(props: {
  base: string;
  metric: MetricInput;
  metricLabel: string;
  drivers: DriverView[];
  currency: string;
  negative: NegativeStyle;
  onRows?: (rows: TornadoRow[]) => void;
  rangeMode?: RangeMode;
}) {
  const { base, metric, drivers, currency, negative } = props;
  const fleet = metric.kind !== 'truck-delta';
  const [ranges, setRanges] = useState<Ranges>({});
  const realistic = (props.rangeMode ?? 'realistic') === 'realistic';
  const [relative, setRelative] = useState(0.2);
  const body = realistic ? { metric, ranges, mode: 'realistic' } : { metric, ranges, mode: 'relative', relative };
  const { data, error, isLoading } = usePost<{ baseValue: number; rows: TornadoRow[] }>(`${base}/tornado`, body);
  const byId = new Map(drivers.map((d) => [d.id, d]));
  const { onRows } = props;
  useEffect(() => {
    if (data) onRows?.(data.rows);
  }, [data, onRows]);
  const unit = `${currency} ${moneyScale(fleet).suffix}`;

  return (
    <section aria-labelledby="tornado-title" className="card p-4">
      <div className="mb-2 flex items-end justify-between gap-4">
        <div>
          <h2 id="tornado-title" className="text-base font-semibold">Which drivers matter</h2>
          <p className="text-sm text-muted">{props.metricLabel} with each driver at its low and high value, the others as in the case; largest swing first.</p>
        </div>
        {realistic ? null : <label className="text-sm">
          <span className="label">Default range (±%)</span>
          <select className="field w-24" value={relative} onChange={(e) => setRelative(Number(e.target.value))} aria-label="Default range">
            {[0.1, 0.2, 0.3, 0.5].map((r) => (
              <option key={r} value={r}>±{r * 100} %</option>
            ))}
          </select>
        </label>}
      </div>
      <p className="mb-2 text-xs text-muted" data-testid="tornado-range-note">
        {realistic
          ? 'Each driver over its realistic range (hover a driver for the range and where it comes from; the methodology lists them all), clipped to the input limits; type over a low or high to change it.'
          : `Every driver ±${relative * 100} % of its value in the case; a driver at 0 (carbon price) over its absolute range. Clipped to the input limits.`}
      </p>
      {error ? <p role="alert" className="text-sm text-loss">{error.message} {error.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}</p> : null}
      {isLoading && !data ? <p className="text-sm text-muted" aria-live="polite">Computing the tornado…</p> : null}
      {data ? (
        <>
          <TornadoChart rows={data.rows} baseValue={data.baseValue} drivers={byId} fleet={fleet} currency={currency} metricLabel={props.metricLabel} negative={negative} />
          <div className="mt-3 max-h-96 overflow-y-auto">
            <table className="data-table" data-testid="tornado-table">
              <thead>
                <tr>
                  <th>Driver</th>
                  <th className="n">Base</th>
                  <th className="n">Low</th>
                  <th className="n">High</th>
                  <th className="n">At low ({unit})</th>
                  <th className="n">At high ({unit})</th>
                  <th className="n">Swing ({unit})</th>
                </tr>
              </thead>
              <tbody>
                {data.rows.map((r) => {
                  const d = byId.get(r.driver);
                  return (
                    <tr key={r.driver} data-driver={r.driver}>
                      <td title={d?.rangeSource ? `Realistic range: ${driverValue(d, d.realistic?.[0])} to ${driverValue(d, d.realistic?.[1])} — ${d.rangeSource}` : undefined}>{d?.label ?? r.driver} <span className="text-xs text-muted">{d?.unit}</span></td>
                      <td className="n">{driverValue(d, r.base)}</td>
                      <td className="n"><RangeInput driver={d} value={r.low} label={`Low value of ${d?.label}`} onCommit={(v) => setRanges((x) => ({ ...x, [r.driver]: { low: v, high: x[r.driver]?.high ?? r.high } }))} /></td>
                      <td className="n"><RangeInput driver={d} value={r.high} label={`High value of ${d?.label}`} onCommit={(v) => setRanges((x) => ({ ...x, [r.driver]: { low: x[r.driver]?.low ?? r.low, high: v } }))} /></td>
                      <td className="n">{money(r.metricLow, fleet, negative)}</td>
                      <td className="n">{money(r.metricHigh, fleet, negative)}</td>
                      <td className="n">{money(r.swing, fleet, negative)}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          {Object.keys(ranges).length ? (
            <button type="button" className="btn mt-2" onClick={() => setRanges({})}>{realistic ? 'Reset to the realistic ranges' : `Reset ranges to ±${relative * 100} %`}</button>
          ) : null}
        </>
      ) : null}
    </section>
  );
}

/** A number typed in the driver's display unit (percent for rates), committed on Enter or leaving the field. */
function RangeInput({ driver, value, label, onCommit }: { driver: DriverView | undefined; value: number; label: string; onCommit: (v: number) => void }) {
  const shown = driver ? toInput(driver, value) : value;
  const [draft, setDraft] = useState<string | null>(null);
  const commit = () => {
    if (draft === null) return;
    const n = Number(draft);
    setDraft(null);
    if (draft.trim() !== '' && Number.isFinite(n) && driver) onCommit(fromInput(driver, n));
  };
  return (
    <input
      type="number"
      step="any"
      aria-label={label}
      className="field w-28 py-0.5 text-right"
      value={draft ?? String(shown)}
      onChange={(e) => setDraft(e.target.value)}
      onBlur={commit}
      onKeyDown={(e) => e.key === 'Enter' && commit()}
    />
  );
}
