import type { CaseResultDto } from '@/lib/cases/types';
import { POLICIES } from '@/lib/engine/types';
import { formatMoney, formatNumber, signTone } from '@/lib/format';
import { periodName } from '@/lib/plan/fiscal-year';
import { POLICY_COLOUR, POLICY_LABEL } from './policy';

/** The fleet at a glance: NPV per policy and of the best mix, capital by year, fuel and CO2 saved, trucks per best policy. */
export function FleetSummary({ data }: { data: CaseResultDto }) {
  const { fleet } = data.result;
  const neg = data.negativeStyle;
  const m = (x: number) => formatMoney(x, { scale: 'k', negative: neg });
  const yearName = (y: number) => periodName(data.case.plan.startMonth, y, data.fiscalYearStartMonth);
  return (
    <>
    <ProposalHeadline data={data} />
    <section aria-label="Fleet summary" className="grid gap-3 md:grid-cols-3 xl:grid-cols-5" data-testid="fleet-summary">
      <div className="card p-3">
        <h2 className="text-xs font-medium text-muted">Fleet NPV ({data.currency} k)</h2>
        <table className="mt-1 w-full text-sm">
          <tbody>
            {POLICIES.map((p) => (
              <tr key={p}><th scope="row" className="text-left font-normal"><Swatch policy={p} /> {POLICY_LABEL[p]} everything</th><td className="num text-right">{m(fleet.npv[p])}</td></tr>
            ))}
            <tr className="border-t border-rule font-semibold"><th scope="row" className="text-left">Best mix</th><td className="num text-right" data-testid="npv-best">{m(fleet.npv.best)}</td></tr>
          </tbody>
        </table>
      </div>
      <RepowerVsRebuild data={data} />
      <div className="card p-3">
        <h2 className="text-xs font-medium text-muted">Trucks by best policy</h2>
        <ul className="mt-1 space-y-0.5 text-sm">
          {POLICIES.map((p) => (
            <li key={p} className="flex justify-between"><span><Swatch policy={p} /> {POLICY_LABEL[p]}</span><span className="num" data-testid={`count-${p}`}>{data.summary.trucksByBest[p]}</span></li>
          ))}
        </ul>
      </div>
      <div className="card p-3">
        <h2 className="text-xs font-medium text-muted">Comparison: capital of the unconstrained best mix by fiscal year ({data.currency} k)</h2>
        <table className="mt-1 w-full text-sm">
          <tbody>
            {data.summary.capitalByYear.length === 0 ? <tr><td className="text-muted">No repower capital.</td></tr> : null}
            {data.summary.capitalByYear.map((c) => (
              <tr key={c.year}><th scope="row" className="text-left font-normal">{yearName(c.year)}</th><td className="num text-right">{m(c.amount)}</td></tr>
            ))}
            <tr className="border-t border-rule font-semibold"><th scope="row" className="text-left">Total</th><td className="num text-right">{m(fleet.capital.best)}</td></tr>
          </tbody>
        </table>
      </div>
      <div className="card p-3">
        <h2 className="text-xs font-medium text-muted">Comparison: saved a year by the best mix, against rebuilding every engine</h2>
        <dl className="mt-1 space-y-1 text-sm">
          <div className="flex justify-between"><dt>Fuel (kL/yr)</dt><dd className="num">{formatNumber(data.summary.fuelSavedLitresPerYear / 1000, 0)}</dd></div>
          <div className="flex justify-between"><dt>CO2 (t/yr)</dt><dd className="num">{formatNumber(data.summary.co2SavedTonnesPerYear, 0)}</dd></div>
        </dl>
        <p className="mt-2 text-xs text-muted">Each truck&rsquo;s saving over its horizon divided by its horizon years, summed.</p>
      </div>
    </section>
    </>
  );
}

/**
 * The results headline: the proposal the saved plan makes (capital by fiscal
 * year and its gain against rebuilding every engine), with the unconstrained
 * best mix and repowering every truck as labelled comparisons.
 */
export function ProposalHeadline({ data }: { data: CaseResultDto }) {
  const p = data.proposal;
  const m = (x: number) => formatMoney(x, { scale: 'k', negative: data.negativeStyle });
  const tone = (x: number) => signTone(x, { scale: 'k' });
  return (
    <section aria-label="The proposal" className="card p-3" data-testid="proposal-headline">
      <h2 className="text-sm font-semibold">
        The proposal: repower {p.chosenTrucks.length} truck{p.chosenTrucks.length === 1 ? '' : 's'} for <span className="num" data-testid="proposal-capital">{m(p.totalCapital)}</span> {data.currency} k;
        expected NPV gain <span className={`num ${tone(p.gainVsRebuildAll)}`} data-testid="proposal-gain">{m(p.gainVsRebuildAll)}</span> {data.currency} k against rebuilding every engine
      </h2>
      <p className="text-xs text-muted">From the case&rsquo;s saved plan (budgets and shop capacity on the plan page); every truck not repowered keeps or rebuilds, whichever costs less.</p>
      <div className="mt-2 grid gap-3 md:grid-cols-2">
        <table className="w-full text-sm" data-testid="proposal-capital-by-fy">
          <thead className="text-xs text-muted"><tr><th className="text-left font-normal">Fiscal year</th><th className="text-right font-normal">Capital ({data.currency} k)</th><th className="text-right font-normal">Budget ({data.currency} k)</th><th className="text-left font-normal pl-3">Trucks</th></tr></thead>
          <tbody>
            {p.capitalByFiscalYear.length === 0 ? <tr><td colSpan={4} className="text-muted">No repower capital.</td></tr> : null}
            {p.capitalByFiscalYear.map((r) => (
              <tr key={r.fiscalYear} data-testid={`proposal-fy-${r.fiscalYear}`}>
                <th scope="row" className="text-left font-normal">{r.fiscalYear}</th>
                <td className="num text-right">{m(r.capital)}</td>
                <td className="num text-right text-muted">{r.budget === null ? 'no limit' : m(r.budget)}</td>
                <td className="pl-3 text-xs">{r.trucks.join(', ')}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-sm">
          <dt>Comparison: unconstrained best mix, gain against rebuilding every engine</dt><dd className={`num text-right ${tone(p.bestMixGain)}`} data-testid="proposal-best-mix">{m(p.bestMixGain)}</dd>
          <dt className="text-muted">The proposal against the best mix</dt><dd className={`num text-right ${tone(p.gainVsBestMix)}`}>{m(p.gainVsBestMix)}</dd>
          <dt>Comparison: repower every truck, gain against rebuilding every engine</dt><dd className={`num text-right ${tone(p.repowerAllGain)}`} data-testid="proposal-repower-all">{m(p.repowerAllGain)}</dd>
        </dl>
      </div>
    </section>
  );
}

/** The repower programme against rebuilding every engine, with and without the offers' productivity gain. */
function RepowerVsRebuild({ data }: { data: CaseResultDto }) {
  const m = (x: number) => formatMoney(x, { scale: 'k', negative: data.negativeStyle });
  const withGain = data.result.trucks.reduce((s, t) => s + t.repowerVsRebuild.deltaNpv, 0);
  const without = data.withoutGain.fleet;
  const tone = (x: number) => signTone(x, { scale: 'k' });
  return (
    <div className="card p-3" data-testid="fleet-delta">
      <h2 className="text-xs font-medium text-muted">Comparison: repower every truck vs rebuild every engine ({data.currency} k)</h2>
      <table className="mt-1 w-full text-sm">
        <tbody>
          <tr><th scope="row" className="text-left font-normal">ΔNPV</th><td className={`num text-right ${tone(withGain)}`} data-testid="fleet-delta-npv">{m(withGain)}</td></tr>
          <tr><th scope="row" className="text-left font-normal">ΔNPV without the productivity gain</th><td className={`num text-right ${tone(without)}`} data-testid="fleet-delta-npv-no-gain">{m(without)}</td></tr>
          <tr className="border-t border-rule"><th scope="row" className="text-left font-normal text-muted">Worth of the gain</th><td className="num text-right text-muted">{m(withGain - without)}</td></tr>
        </tbody>
      </table>
      <p className="mt-2 text-xs text-muted">
        {data.withoutGain.anyGain
          ? 'The second line is the same case with every repower offer’s productivity gain set to 0.'
          : 'No repower offer in this case claims a productivity gain.'}
      </p>
    </div>
  );
}

export function Swatch({ policy }: { policy: keyof typeof POLICY_LABEL }) {
  return <span aria-hidden className="inline-block h-2.5 w-2.5 rounded-sm align-middle" style={{ background: POLICY_COLOUR[policy] }} />;
}
