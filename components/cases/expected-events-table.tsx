import type { Valuation } from '@/lib/cases/types';
import type { EventCounts, PolicyKey, TruckResult } from '@/lib/engine/types';
import { POLICIES } from '@/lib/engine/types';
import { formatNumber } from '@/lib/format';
import { POLICY_COLOUR, POLICY_LABEL } from './policy';

const KINDS: { key: keyof EventCounts; label: string }[] = [
  { key: 'overhauls', label: 'Overhauls' },
  { key: 'repairs', label: 'Repairs' },
  { key: 'repowers', label: 'Repowers' },
];

/**
 * Engine events per year and policy, from the result's `events` (MODEL.md
 * section 11): expected counts with the expected valuation (fractions: there
 * is no single path of events to draw), whole counts on the median path.
 */
export function ExpectedEventsTable({ result, valuation }: { result: TruckResult; valuation: Valuation }) {
  const expected = valuation === 'expected';
  const digits = expected ? 3 : 0;
  const years = Array.from({ length: result.horizonYears + 1 }, (_, y) => y);
  const cell = (x: number) => (Math.abs(x) < 5e-4 ? '–' : formatNumber(x, digits));
  const total = (p: PolicyKey, k: keyof EventCounts) => result.options[p].events.reduce((s, e) => s + e[k], 0);
  return (
    <section aria-label="Engine events by year" className="card p-3" data-testid="expected-events">
      <h3 className="text-sm font-semibold">{expected ? 'Expected engine events by year' : 'Engine events by year (median failure path)'}</h3>
      <p className="text-xs text-muted">
        {expected
          ? 'With the expected valuation there is no single path of events: each figure is the expected number of overhauls, in-service failures (repairs) and repowers booked in that year, averaged over the engines’ failure ages, so it can be a fraction.'
          : 'Each engine fails at its median failure age: whole events, as the timeline above draws them.'}
      </p>
      <div className="mt-2 overflow-x-auto">
        <table className="data-table w-auto" data-testid="expected-events-table">
          <thead>
            <tr>
              <th rowSpan={2}>Year</th>
              {POLICIES.map((p) => (
                <th key={p} colSpan={3} className="border-l border-rule text-center" style={{ color: POLICY_COLOUR[p] }}>{POLICY_LABEL[p]}</th>
              ))}
            </tr>
            <tr>
              {POLICIES.flatMap((p) => KINDS.map((k, i) => <th key={`${p}${k.key}`} className={`n ${i === 0 ? 'border-l border-rule' : ''}`}>{k.label} (no.)</th>))}
            </tr>
          </thead>
          <tbody>
            {years.map((y) => (
              <tr key={y}>
                <th scope="row" className="px-2 text-left font-normal">{y === 0 ? '0 (now)' : y}</th>
                {POLICIES.flatMap((p) => KINDS.map((k, i) => (
                  <td key={`${p}${k.key}`} className={`n ${i === 0 ? 'border-l border-rule' : ''}`}>{cell(result.options[p].events[y]?.[k.key] ?? 0)}</td>
                )))}
              </tr>
            ))}
            <tr className="font-semibold">
              <th scope="row" className="px-2 text-left">Total</th>
              {POLICIES.flatMap((p) => KINDS.map((k, i) => <td key={`${p}${k.key}`} className={`n ${i === 0 ? 'border-l border-rule' : ''}`}>{cell(total(p, k.key))}</td>))}
            </tr>
          </tbody>
        </table>
      </div>
    </section>
  );
}
