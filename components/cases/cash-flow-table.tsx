'use client';

import { useState } from 'react';
import type { PolicyKey, TruckDetail } from '@/lib/engine/types';
import { BREAKDOWN_CATEGORIES, POLICIES } from '@/lib/engine/types';
import { formatMoney, formatNumber, type NegativeStyle } from '@/lib/format';
import { POLICY_COLOUR, POLICY_LABEL } from './policy';

const CATEGORY_LABEL: Record<(typeof BREAKDOWN_CATEGORIES)[number], string> = {
  fuel: 'Fuel',
  carbon: 'Carbon',
  lube: 'Lube (services and top-up)',
  overhauls: 'Overhauls',
  failures: 'Failures (repairs)',
  capital: 'Repower capital',
  lostMargin: 'Lost margin (days down)',
  extraMargin: 'Extra margin',
  taxEffect: 'Tax effect',
  residual: 'Residual credit (before tax)',
};

/** Year-by-year cash flow of one policy, by category, as the engine booked it (costs negative). */
export function CashFlowTable({ detail, currency, negative }: { detail: TruckDetail; currency: string; negative: NegativeStyle }) {
  const [policy, setPolicy] = useState<PolicyKey>('repower');
  const periods = detail.policies[policy].periods;
  const m = (x: number) => formatMoney(x, { scale: 'k', digits: 1, negative });
  const pv = periods.reduce((s, p) => s + p.cashFlow * p.discountFactor, 0);
  return (
    <section aria-label="Cash flows by year" className="space-y-2">
      <div role="group" aria-label="Policy" className="flex gap-1">
        {POLICIES.map((p) => (
          <button key={p} type="button" aria-pressed={policy === p} onClick={() => setPolicy(p)} className={`btn py-0.5 ${policy === p ? 'border-ink font-semibold' : ''}`}>
            <span aria-hidden className="inline-block h-2.5 w-2.5 rounded-sm" style={{ background: POLICY_COLOUR[p] }} /> {POLICY_LABEL[p]}
          </button>
        ))}
      </div>
      <div className="card overflow-x-auto">
        <table className="data-table" data-testid="cash-flow-table">
          <caption className="px-2 py-1 text-left text-xs text-muted">{POLICY_LABEL[policy]}: cash by category and year ({currency} k, costs negative). Year 0 is now.</caption>
          <thead>
            <tr>
              <th className="sticky left-0 z-10 bg-white">Category</th>
              {periods.map((p) => <th key={p.period} className="n">Y{p.period}</th>)}
            </tr>
          </thead>
          <tbody>
            {BREAKDOWN_CATEGORIES.map((c) => (
              <tr key={c}>
                <th scope="row" className="sticky left-0 z-10 whitespace-nowrap bg-white text-left font-normal shadow-[1px_0_0_#e3e4e1]">{CATEGORY_LABEL[c]}</th>
                {periods.map((p) => <td key={p.period} className="n">{Math.abs(p.breakdown[c]) < 0.5 ? '–' : m(p.breakdown[c])}</td>)}
              </tr>
            ))}
            <tr className="font-semibold">
              <th scope="row" className="sticky left-0 z-10 whitespace-nowrap bg-white text-left shadow-[1px_0_0_#e3e4e1]">Cash flow</th>
              {periods.map((p) => <td key={p.period} className="n">{m(p.cashFlow)}</td>)}
            </tr>
            <tr className="text-muted">
              <th scope="row" className="sticky left-0 z-10 whitespace-nowrap bg-white text-left font-normal shadow-[1px_0_0_#e3e4e1]">Discount factor</th>
              {periods.map((p) => <td key={p.period} className="n">{formatNumber(p.discountFactor, 4)}</td>)}
            </tr>
            <tr>
              <th scope="row" className="sticky left-0 z-10 whitespace-nowrap bg-white text-left font-normal shadow-[1px_0_0_#e3e4e1]">Discounted</th>
              {periods.map((p) => <td key={p.period} className="n">{m(p.cashFlow * p.discountFactor)}</td>)}
            </tr>
            <tr className="text-muted">
              <th scope="row" className="sticky left-0 z-10 whitespace-nowrap bg-white text-left font-normal shadow-[1px_0_0_#e3e4e1]">Hours · fuel (kL)</th>
              {periods.map((p) => <td key={p.period} className="n whitespace-nowrap">{formatNumber(p.hours, 0)} · {formatNumber(p.fuelLitres / 1000, 0)}</td>)}
            </tr>
          </tbody>
        </table>
      </div>
      <p className="text-sm">NPV ({POLICY_LABEL[policy].toLowerCase()}): <strong className="num">{formatMoney(pv, { negative })} {currency}</strong></p>
    </section>
  );
}
