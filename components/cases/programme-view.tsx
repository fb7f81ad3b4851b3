'use client';

import { Fragment, useState } from 'react';
import Link from 'next/link';
import type { ProgrammeDto, ProgrammeTruckDto } from '@/lib/cases/programme-types';
import { formatMoney, type NegativeStyle } from '@/lib/format';
import { bindingSentence, moneyK, optionWords, programmeMessage, statusSentence, timingNote } from '@/lib/plan/programme-words';
import { ProgrammeChart } from './programme-chart';

/**
 * The fleet programme (issue 15) as the plan page shows it: the solver's status, each truck's chosen timing with
 * what the budgets and the shop cost it and its alternatives, what one more unit of each binding constraint adds,
 * and the fleet by fiscal year. The figures are the programme route's (lib/cases/programme.ts); the words come
 * from lib/plan/programme-words.ts.
 */
export function ProgrammeView({ programme: p, slug, caseId, headline }: { programme: ProgrammeDto; slug: string; caseId: number; headline?: React.ReactNode }) {
  const neg = p.negativeStyle as NegativeStyle;
  const message = programmeMessage(p);
  return (
    <section aria-labelledby="programme-heading" className="card space-y-3 p-3" data-testid="programme">
      <div>
        <h2 id="programme-heading" className="text-sm font-semibold">The fleet programme: when to repower each truck, within the budgets and the shop&rsquo;s capacity</h2>
        <p className="text-sm" data-testid="programme-status">{statusSentence(p)}</p>
        {message ? <div role="alert" className="mt-2 rounded border border-loss/40 p-2 text-sm text-loss" data-testid="programme-message">{message}</div> : null}
        {headline}
      </div>
      {p.ok && p.trucks.length > 0 ? (
        <>
          <TruckTable p={p} slug={slug} caseId={caseId} neg={neg} />
          <Binding p={p} neg={neg} />
          <ShopMonths p={p} />
          <ProgrammeChart periods={p.periods} currency={p.currency} negative={neg} />
        </>
      ) : null}
    </section>
  );
}

function TruckTable({ p, slug, caseId, neg }: { p: ProgrammeDto; slug: string; caseId: number; neg: NegativeStyle }) {
  const [open, setOpen] = useState<ReadonlySet<string>>(new Set());
  const toggle = (id: string) => setOpen((was) => {
    const next = new Set(was);
    if (next.has(id)) next.delete(id);
    else next.add(id);
    return next;
  });
  const k = (x: number) => formatMoney(x, { scale: 'k', negative: neg });
  const cur = p.currency;
  const forced = p.trucks.filter((t) => t.forcedDelay).length;
  return (
    <div className="overflow-x-auto">
      <h3 className="text-sm font-semibold">Each truck&rsquo;s timing</h3>
      <p className="text-xs text-muted">
        The chosen timing and its planned swap month (no failure before it; a failure brings the swap forward). &ldquo;Cost of the limits&rdquo; is the expected NPV the truck gives up against its best timing, the one it would take with no budget and an empty shop.
        {forced ? ` ${forced} truck${forced === 1 ? ' is' : 's are'} delayed past the due month by the budgets or the shop (marked).` : ' No truck is delayed past its due month by the budgets or the shop.'}
      </p>
      <table className="data-table mt-1" data-testid="programme-trucks">
        <thead>
          <tr><th>Truck</th><th>Chosen timing</th><th>Planned swap</th><th className="n">Planned capital ({cur} k)</th><th className="n">Expected NPV ({cur} k)</th><th className="n">Cost of the limits ({cur} k)</th><th>Why not its best</th><th>Alternatives</th></tr>
        </thead>
        <tbody>
          {p.trucks.map((t) => {
            const note = timingNote(t, p, cur, neg);
            const shown = open.has(t.truckId);
            const listId = `alternatives-${t.truckId}`;
            return (
              <Fragment key={t.truckId}>
                <tr data-truck={t.truckId} data-forced={t.forcedDelay ? 'yes' : 'no'} className={t.forcedDelay ? 'bg-caution-ground' : ''}>
                  <td className="whitespace-nowrap"><Link className="font-mono text-xs text-accent hover:underline" href={`/${slug}/cases/${caseId}/trucks/${encodeURIComponent(t.truckId)}`}>{t.truckId}</Link></td>
                  <td data-cell="chosen">{t.chosen.label}</td>
                  <td className="whitespace-nowrap font-mono text-xs" data-cell="month">{t.chosen.monthLabel ?? 'no swap'}</td>
                  <td className="n" data-cell="capital">{k(t.chosen.plannedCapital)}</td>
                  <td className="n" data-cell="npv">{k(t.chosen.npv)}</td>
                  <td className={`n ${t.cost > 0 ? 'text-loss' : ''}`} data-cell="cost">{t.cost > 0 ? moneyK(t.cost, neg) : '0'}</td>
                  <td className="min-w-64 text-xs" data-cell="note" data-testid={t.forcedDelay ? `moved-${t.truckId}` : undefined}>{note ?? (t.chosen.delayMonths > 0 ? `${t.chosen.delayMonths} month${t.chosen.delayMonths === 1 ? '' : 's'} past its due month: running the old engine on pays` : 'its best timing')}</td>
                  <td>
                    <button type="button" className="btn whitespace-nowrap py-0.5 text-xs" aria-expanded={shown} aria-controls={listId} onClick={() => toggle(t.truckId)}>
                      {shown ? 'Hide' : 'Show'} {t.alternatives.length} alternative{t.alternatives.length === 1 ? '' : 's'}<span className="sr-only"> of {t.truckId}</span>
                    </button>
                  </td>
                </tr>
                {shown ? (
                  <tr data-alternatives-of={t.truckId}>
                    <td colSpan={8} className="bg-paper">
                      <Alternatives t={t} id={listId} currency={cur} neg={neg} />
                    </td>
                  </tr>
                ) : null}
              </Fragment>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

function Alternatives({ t, id, currency, neg }: { t: ProgrammeTruckDto; id: string; currency: string; neg: NegativeStyle }) {
  const k = (x: number) => formatMoney(x, { scale: 'k', negative: neg });
  return (
    <table className="data-table my-1" id={id} data-testid={id}>
      <caption className="text-left text-xs text-muted">{t.truckId}: the other timings, best first, against the chosen ({optionWords(t.chosen)}, {k(t.chosen.npv)} {currency} k)</caption>
      <thead><tr><th>Timing</th><th>Planned swap</th><th className="n">Planned capital ({currency} k)</th><th className="n">Expected NPV ({currency} k)</th><th className="n">Δ NPV against the chosen ({currency} k)</th></tr></thead>
      <tbody>
        {t.alternatives.map((a) => (
          <tr key={a.key} data-option={a.key}>
            <td>{a.label}{a.key === t.best.key ? <span className="ml-1 text-xs font-semibold text-accent">best without limits</span> : null}</td>
            <td className="font-mono text-xs">{a.monthLabel ?? 'no swap'}</td>
            <td className="n">{k(a.plannedCapital)}</td>
            <td className="n" data-cell="npv">{k(a.npv)}</td>
            <td className={`n ${a.npv > t.chosen.npv ? 'text-gain' : ''}`}>{moneyK(a.npv - t.chosen.npv, neg)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function Binding({ p, neg }: { p: ProgrammeDto; neg: NegativeStyle }) {
  return (
    <div data-testid="programme-binding">
      <h3 className="text-sm font-semibold">What each limit at its edge costs</h3>
      {p.binding.length === 0 ? (
        <p className="text-sm text-muted">No budget and no shop month is at its limit: more of either would not change the plan.</p>
      ) : (
        <>
          <p className="text-xs text-muted">Each budget spent to its limit and each month the shop is full, with the plan solved again given one more unit of it.</p>
          <ul className="mt-1 list-disc space-y-0.5 pl-5 text-sm">
            {p.binding.map((b) => (
              <li key={`${b.kind}-${b.index}`} data-kind={b.kind} data-index={b.index}>{bindingSentence(b, p.currency, neg)}</li>
            ))}
          </ul>
        </>
      )}
    </div>
  );
}

/** The shop's months the plan uses or the settings change (a month with no swap at the usual capacity is left out). */
function ShopMonths({ p }: { p: ProgrammeDto }) {
  const usual = p.settings.swapsPerMonth;
  const shown = p.months.filter((m) => m.used > 0 || m.capacity !== usual);
  return (
    <div className="overflow-x-auto">
      <h3 className="text-sm font-semibold">The shop by month</h3>
      <p className="text-xs text-muted">Planned swaps against the shop&rsquo;s capacity ({usual} a month unless set otherwise), in the months with a swap planned or a capacity of their own; a failure before the planned month brings a swap forward.</p>
      {shown.length === 0 ? (
        <p className="text-sm text-muted">No swap is planned and every month has the usual capacity.</p>
      ) : (
        <table className="data-table mt-1" data-testid="programme-months">
          <thead><tr><th>Month</th><th className="n">Swaps planned</th><th className="n">Capacity (swaps)</th><th>Note</th></tr></thead>
          <tbody>
            {shown.map((m) => (
              <tr key={m.month} data-month={m.label} className={m.shutdown ? 'bg-caution-ground' : ''}>
                <td className="font-mono text-xs">{m.label}</td>
                <td className="n" data-cell="used">{m.used}</td>
                <td className="n" data-cell="capacity">{m.capacity}</td>
                <td className="text-xs" data-cell="note">{m.shutdown ? 'shut' : m.used >= m.capacity ? 'full' : `room for ${m.capacity - m.used} more`}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
