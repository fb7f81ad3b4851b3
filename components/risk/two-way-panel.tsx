'use client';
import { useState } from 'react';
import type { NegativeStyle } from '@/lib/format';
import { driverValue, money, moneyScale } from './format';
import type { DriverView, MetricInput, TwoWayTable } from './types';
import { usePost } from './use-post';

/** The metric over a 5 × 5 grid of two drivers (−20 % to +20 %), shaded by sign and size. */
export function TwoWayPanel(props: { base: string; metric: MetricInput; metricLabel: string; drivers: DriverView[]; currency: string; negative: NegativeStyle; initial: [string, string] }) {
  const [row, setRow] = useState(props.initial[0]);
  const [column, setColumn] = useState(props.initial[1]);
  const fleet = props.metric.kind !== 'truck-delta';
  const same = row === column;
  const { data, error } = usePost<{ baseValue: number; table: TwoWayTable }>(same ? null : `${props.base}/two-way`, { metric: props.metric, row, column });
  const byId = new Map(props.drivers.map((d) => [d.id, d]));
  const t = data?.table;
  const max = t ? Math.max(...t.metric.flat().map(Math.abs)) || 1 : 1;
  const shade = (v: number) => {
    const a = 0.08 + 0.5 * Math.min(1, Math.abs(v) / max);
    return v < 0 ? `rgba(179, 38, 30, ${a})` : `rgba(46, 118, 80, ${a})`;
  };
  const select = (label: string, value: string, set: (v: string) => void) => (
    <label className="text-sm">
      <span className="label">{label}</span>
      <select className="field w-72" value={value} onChange={(e) => set(e.target.value)} aria-label={label}>
        {props.drivers.map((d) => (
          <option key={d.id} value={d.id}>{d.label}</option>
        ))}
      </select>
    </label>
  );
  return (
    <section aria-labelledby="two-way-title" className="card p-4">
      <h2 id="two-way-title" className="text-base font-semibold">Two drivers at once</h2>
      <p className="mb-2 text-sm text-muted">{props.metricLabel} ({props.currency} {moneyScale(fleet).suffix}) over a grid of two drivers; green pays, red loses.</p>
      <div className="mb-3 flex flex-wrap gap-3">
        {select('Rows', row, setRow)}
        {select('Columns', column, setColumn)}
      </div>
      {same ? <p role="alert" className="text-sm text-loss">Choose two different drivers.</p> : null}
      {error ? <p role="alert" className="text-sm text-loss">{error.message}</p> : null}
      {t ? (
        <table className="data-table w-auto" data-testid="two-way-table">
          <thead>
            <tr>
              <th>{byId.get(row)?.label} ↓ / {byId.get(column)?.label} →</th>
              {t.columnValues.map((c) => (
                <th key={c} className="n">{driverValue(byId.get(column), c)}</th>
              ))}
            </tr>
          </thead>
          <tbody>
            {t.rowValues.map((r, i) => (
              <tr key={r}>
                <th scope="row" className="px-2 text-right text-xs font-medium text-muted">{driverValue(byId.get(row), r)}</th>
                {t.metric[i].map((v, j) => (
                  <td key={j} className="n" style={{ background: shade(v), fontWeight: i === 2 && j === 2 ? 600 : undefined }}>
                    {money(v, fleet, props.negative)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </section>
  );
}
