import type { TimelineEvent } from '@/lib/cases/types';
import type { PolicyKey } from '@/lib/engine/types';
import { POLICIES } from '@/lib/engine/types';
import { formatMoney, formatNumber } from '@/lib/format';
import { POLICY_COLOUR, POLICY_LABEL } from './policy';

const MARK: Record<TimelineEvent['kind'], { symbol: string; label: string }> = {
  overhaul: { symbol: '◆', label: 'Overhaul' },
  failure: { symbol: '✕', label: 'Failure (repair)' },
  repower: { symbol: '▲', label: 'Repower' },
};

/** Each policy's engine events on one time axis (months from now), with the list beneath. */
export function EventTimeline({ events, horizonYears, currency }: { events: Record<PolicyKey, TimelineEvent[]>; horizonYears: number; currency: string }) {
  const months = Math.max(12, horizonYears * 12);
  const at = (m: number) => `${Math.min(100, (m / months) * 100)}%`;
  return (
    <section aria-label="Events timeline" className="card p-3" data-testid="event-timeline">
      <h3 className="text-sm font-semibold">Engine events by policy (axis: years from now; the table gives the year each event is booked in)</h3>
      <p className="text-xs text-muted">{Object.values(MARK).map((k) => `${k.symbol} ${k.label}`).join('   ')}</p>
      <div className="mt-2 space-y-2">
        {POLICIES.map((p) => (
          <div key={p} className="flex items-center gap-2">
            <span className="w-16 text-xs font-medium" style={{ color: POLICY_COLOUR[p] }}>{POLICY_LABEL[p]}</span>
            <div className="relative h-5 flex-1 border-b border-rule">
              {Array.from({ length: horizonYears + 1 }, (_, y) => (
                <span key={y} aria-hidden className="absolute bottom-0 h-1.5 border-l border-rule" style={{ left: at(y * 12) }} />
              ))}
              {events[p].map((e, i) => (
                <span key={i} className="absolute -translate-x-1/2 text-sm leading-none" style={{ left: at(e.month), color: POLICY_COLOUR[p], top: 0 }} title={`${MARK[e.kind].label}, year ${e.period}, engine at ${formatNumber(e.engineAge, 0)} h, ${formatMoney(e.cost)} ${currency}, ${formatNumber(e.downtimeDays, 1)} days down`}>
                  {MARK[e.kind].symbol}
                </span>
              ))}
            </div>
          </div>
        ))}
        <div className="flex gap-2 pl-[4.5rem] text-[10px] text-muted">
          <div className="relative h-3 flex-1">
            {Array.from({ length: horizonYears + 1 }, (_, y) => <span key={y} className="absolute -translate-x-1/2" style={{ left: at(y * 12) }}>{y}</span>)}
          </div>
        </div>
      </div>
      <table className="data-table mt-3">
        <thead><tr><th>Policy</th><th>Event</th><th className="n">Year</th><th className="n">Engine age (h)</th><th className="n">Cost ({currency})</th><th className="n">Days down</th></tr></thead>
        <tbody>
          {POLICIES.flatMap((p) => events[p].map((e, i) => (
            <tr key={`${p}${i}`}>
              <td style={{ color: POLICY_COLOUR[p] }}>{POLICY_LABEL[p]}</td>
              <td>{MARK[e.kind].symbol} {MARK[e.kind].label}</td>
              <td className="n">{e.period}</td>
              <td className="n">{formatNumber(e.engineAge, 0)}</td>
              <td className="n">{formatMoney(e.cost)}</td>
              <td className="n">{formatNumber(e.downtimeDays, 1)}</td>
            </tr>
          )))}
        </tbody>
      </table>
    </section>
  );
}
