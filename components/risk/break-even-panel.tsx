'use client';
import type { NegativeStyle } from '@/lib/format';
import { changeLabel, driverValue, money, moneyScale } from './format';
import type { BreakEven, DriverView, MetricInput } from './types';
import { usePost } from './use-post';

/**
 * For each driver, where the repower (or the proposal) stops paying (ΔNPV = 0), or a plain "none within the range".
 * The best mix has no break-even of its own (it is not a Δ), so it shows the proposal's.
 */
export function BreakEvenPanel(props: { base: string; metric: MetricInput; drivers: DriverView[]; currency: string; negative: NegativeStyle; ready?: boolean }) {
  const fleet = props.metric.kind !== 'truck-delta';
  const metric = props.metric.kind === 'fleet-best' ? ({ kind: 'proposal' } as const) : props.metric;
  const subject = metric.kind === 'proposal' ? 'the proposal' : 'the repower';
  const what =
    metric.kind === 'proposal'
      ? 'ΔNPV of the proposal against rebuilding every engine'
      : metric.kind === 'fleet-delta'
        ? 'ΔNPV of repowering every truck against rebuilding (a comparison)'
        : 'ΔNPV of repower against rebuild';
  const { data, error } = usePost<{ baseValue: number; rows: BreakEven[] }>(props.ready === false ? null : `${props.base}/break-even`, { metric });
  const byId = new Map(props.drivers.map((d) => [d.id, d]));
  const pays = data ? data.baseValue > 0 : true;
  const rows = data ? [...data.rows].sort((a, b) => Number(a.kind === 'none') - Number(b.kind === 'none')) : [];
  return (
    <section aria-labelledby="break-even-title" className="card p-4">
      <h2 id="break-even-title" className="text-base font-semibold">Where {subject} stops paying</h2>
      <p className="mb-2 text-sm text-muted">
        The value of each driver, the others as in the case, at which {what} is zero. Today it is{' '}
        {data ? `${money(data.baseValue, fleet, props.negative)} ${props.currency} ${moneyScale(fleet).suffix}` : '…'}
        {data ? (pays ? `: ${subject} pays.` : `: ${subject} does not pay.`) : ''}
      </p>
      {error ? <p role="alert" className="text-sm text-loss">{error.message}</p> : null}
      {!data && !error ? <p className="text-sm text-muted" aria-live="polite">Searching each driver for its break-even…</p> : null}
      {data ? (
        <div className="max-h-96 overflow-y-auto">
          <table className="data-table" data-testid="break-even-table">
            <thead>
              <tr>
                <th>Driver</th>
                <th>Unit</th>
                <th className="n">In the case</th>
                <th className="n">Break-even</th>
                <th className="n" title="Rates and shares in percentage points (pp), other drivers in % of their value in the case">Change</th>
                <th>Searched</th>
                <th>Reading</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => {
                const d = byId.get(r.driver);
                return (
                  <tr key={r.driver} data-driver={r.driver}>
                    <td>{d?.label ?? r.driver}</td>
                    <td className="text-xs text-muted">{d?.unit}</td>
                    <td className="n whitespace-nowrap">{driverValue(d, r.base)}</td>
                    <td className="n whitespace-nowrap font-medium">{r.kind === 'none' ? '—' : driverValue(d, r.value)}</td>
                    <td className="n whitespace-nowrap" data-testid="break-even-change">{r.kind === 'none' ? '' : changeLabel(d, r.base, r.value)}</td>
                    <td className="text-xs text-muted">{driverValue(d, r.rangeLow)} to {driverValue(d, r.rangeHigh)}</td>
                    <td className="text-xs">{reading(r, subject)}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ) : null}
    </section>
  );
}

function reading(r: BreakEven, subject: string): string {
  if (r.kind === 'none') return r.signThroughout && r.signThroughout > 0 ? `None within the range: ${subject} pays throughout.` : `None within the range: ${subject} loses throughout.`;
  const side = r.value !== null && r.value > r.base ? 'above' : 'below';
  const turns = r.baseMetric > 0 ? 'stops paying' : 'starts paying';
  if (r.kind === 'step') return `The answer jumps across zero here (an overhaul or failure moves in or out of the horizon); ${subject} ${turns} ${side} this value.`;
  return `${subject[0].toUpperCase()}${subject.slice(1)} ${turns} ${side} this value.`;
}
