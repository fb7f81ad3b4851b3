import type { ReactNode } from 'react';

const F = ({ children }: { children: ReactNode }) => <code className="rounded bg-paper px-1 font-mono text-[0.8rem]">{children}</code>;
const S = ({ id, title, children }: { id: string; title: string; children: ReactNode }) => (
  <section id={id} aria-labelledby={`${id}-h`} className="card space-y-2 p-4 text-sm leading-relaxed">
    <h2 id={`${id}-h`} className="text-base font-semibold">{title}</h2>
    {children}
  </section>
);

/** How Haulcase computes a business case, in plain words and formulas; written for this product from its model contract. */
export function MethodologyContent() {
  return (
    <div className="max-w-4xl space-y-4">
      <nav aria-label="On this page" className="text-sm">
        {[['decision', 'The decision'], ['time', 'Time and prices'], ['events', 'Engine events'], ['fuel', 'Fuel and CO2'], ['downtime', 'Days down and production'], ['tax', 'Tax and depreciation'], ['residual', 'Residual credit'], ['results', 'Results per truck'], ['comparisons', 'Comparing policies'], ['plan', 'Ranking, capital plan, schedule'], ['limits', 'Simplifications']].map(([id, t]) => (
          <a key={id} href={`#${id}`} className="mr-3 text-accent underline">{t}</a>
        ))}
      </nav>
      <S id="decision" title="The decision">
        <p>For every truck we compare three policies over the truck&rsquo;s remaining life: <strong>keep</strong> (run the current engine with no planned overhaul, repair it when it fails, and carry on), <strong>rebuild</strong> (overhaul the current engine each time it reaches its planned life), and <strong>repower</strong> (fit a new engine module from the chosen offer, either at the next planned overhaul or now, then overhaul that engine at its own planned life).</p>
        <p>The figures on screen follow the median path: every engine fails at its median failure age unless a planned event comes first. Risk analysis samples failure ages instead.</p>
      </S>
      <S id="time" title="Time and prices">
        <p>Year 0 is today; years 1 to N follow, and cash falls at the end of each year (or mid-year if the assumption set says so). The horizon is <F>N = ⌈remaining life hours ÷ annual hours⌉</F>, capped by the assumption set&rsquo;s horizon when one is set. Hours in year y are <F>H_y = min(annual hours, remaining life − (y−1)·annual hours)</F>.</p>
        <p>The discount rate r is nominal: <F>DF_y = (1+r)^−y</F> (end of year) or <F>(1+r)^−(y−½)</F> (mid-year). Prices entered are year-1 prices; a price p₀ growing at g costs <F>p₀·(1+g)^(y−1)</F> in year y and p₀ in year 0. Fuel grows with fuel escalation, carbon with carbon escalation, everything else with inflation.</p>
      </S>
      <S id="events" title="Engine events">
        <p>Each policy tracks the hours on the engine fitted since it was new or last overhauled or repaired. An event (overhaul, failure, repower) books its costs in the year whose hours it falls in. An engine already at or past its planned life today has its planned event now, in year 0.</p>
        <p>With Weibull shape β and scale η, the engine fitted today (age a₀) fails at its conditional median age <F>η·((a₀/η)^β + ln 2)^(1/β)</F>; a new or rebuilt engine at its median life <F>η·(ln 2)^(1/β)</F>. <em>Keep</em> repairs at each failure (failure cost and days down). <em>Rebuild</em> overhauls at planned life unless failure comes first. <em>Repower</em> replaces the current engine&rsquo;s first event by the swap: capital = module price + install − core credit, at that year&rsquo;s prices, with the module&rsquo;s days down; the new engine then follows the rebuild rule.</p>
        <p>Oil services fall at every multiple of the service interval; each costs sump litres × lube price + kit + labour hours × labour rate, and top-up oil is charged per hour run.</p>
      </S>
      <S id="fuel" title="Fuel and CO2">
        <p>The truck&rsquo;s power demand is the same whatever engine is fitted: <F>P = load factor × rated kW</F> of its engine today. An engine burns <F>P × BSFC ÷ (1000 × fuel density)</F> litres an hour; a measured burn on the truck scales every engine&rsquo;s figure by measured ÷ modelled. CO2 is litres × kg CO2 per litre ÷ 1000 (2.697 kg/L for diesel by default).</p>
      </S>
      <S id="downtime" title="Days down and production">
        <p>A day down costs the margin the truck would have earned: <F>days × annual hours ÷ 365 × t/h × margin per tonne</F>. A repower&rsquo;s productivity gain adds tonnes and margin after the swap, counted as a taxable gain.</p>
      </S>
      <S id="tax" title="Tax and depreciation">
        <p>Running costs (and, by default, overhauls and repairs) are deducted in the year they fall, so they cost (1 − tax rate) of their amount. The repower&rsquo;s capital is depreciated (none, straight line, declining balance or the published MACRS half-year tables), each year&rsquo;s shield being tax rate × depreciation. At the end of year N any basis left is written off, and the residual credit is taxed.</p>
      </S>
      <S id="residual" title="Residual credit">
        <p>At the end of year N the engine fitted is worth its unused hours: <F>overhaul cost × max(0, 1 − hours since overhaul ÷ life hours)</F> at year-N prices, whichever policy ran it.</p>
      </S>
      <S id="results" title="Results per truck and policy">
        <p>Cash flow <F>CF_y</F> = − after-tax costs + after-tax extra margin − capital + tax shields + after-tax residual (year N). Each year&rsquo;s categories (fuel, carbon, lube, overhauls, failures, capital, lost margin, extra margin, tax effect, residual) add up to it.</p>
        <ul className="list-disc pl-5">
          <li><strong>NPV</strong> = Σ CF_y · DF_y; negative, since it is mostly cost. The best policy has the highest NPV (ties go to rebuild, then keep).</li>
          <li><strong>Equivalent annual cost</strong> = −NPV · r(1+r)^N ÷ ((1+r)^N − 1).</li>
          <li><strong>Cost per hour</strong> and <strong>per tonne</strong>: −(NPV − PV of extra margin) ÷ discounted hours or tonnes (levelised cost).</li>
          <li><strong>Fuel (L/h)</strong>: litres over the horizon ÷ hours.</li>
        </ul>
      </S>
      <S id="comparisons" title="Comparing policies">
        <p>On the results page repower is compared with each truck&rsquo;s <em>better other policy</em> (the higher NPV of keep and rebuild). With ΔCF_y = CF_y(repower) − CF_y(other):</p>
        <ul className="list-disc pl-5">
          <li><strong>ΔNPV</strong> = Σ ΔCF_y · DF_y: the gain of repowering.</li>
          <li><strong>IRR</strong>: the rate at which Σ ΔCF_y ÷ (1+i)^y = 0, shown only when exactly one such rate exists between −99 % and 1,000 % and the Δ starts with an investment. Otherwise it is blank and the table says why: no investment, several sign changes (read MIRR instead), or no rate in range.</li>
          <li><strong>MIRR</strong>: (future value at r of the positive ΔCF ÷ −present value at r of the negative ΔCF)^(1/N) − 1.</li>
          <li><strong>Payback</strong>: years from the investment until the running sum of ΔCF reaches zero, linear within the year; <strong>discounted payback</strong> the same on ΔCF · DF.</li>
          <li><strong>PI</strong> = 1 + ΔNPV ÷ present value of the repower capital.</li>
        </ul>
      </S>
      <S id="plan" title="Ranking, capital plan and schedule">
        <p>Trucks are ranked by the gain of repowering (ΔNPV against the better other policy), then by PI. For each year in which repower capital is spent, the plan chooses the set of repowers with the largest total gain whose capital fits that year&rsquo;s budget. This is a 0/1 knapsack solved exactly by dynamic programming on money in whole thousands: each cost is rounded up and the budget down to a thousand, so a chosen set never exceeds the budget, and no other set within that resolution gains more. Picking by highest PI first can lose: with a 10 M budget, one 6 M repower of PI 2.2 blocks two 5 M repowers of PI 2.1 that together gain more. For each repower left out the plan shows the extra budget needed to add it to the chosen set (its capital less what is left unspent). A year with no budget is not limited; a repower that does not gain is never chosen.</p>
        <p>Each chosen swap is scheduled in the month its engine reaches the event the repower replaces (from the engine hours, life and annual hours on the model&rsquo;s own path). At most the set number of swaps fit in a month; larger gains keep their month, and an excess swap moves to the nearest earlier month with room and is flagged. If no earlier month has room it goes to the next month with room, flagged as late.</p>
      </S>
      <S id="limits" title="Simplifications, on purpose">
        <ul className="list-disc pl-5">
          <li>Days down do not change hours, fuel or later events; lost margin stands for the lost production.</li>
          <li>Tax losses are used at once (the owner is taxable overall).</li>
          <li>The deterministic run uses median failure ages; spread is the job of the risk analysis.</li>
          <li>Fleet fuel and CO2 saved a year: each truck&rsquo;s saving over its horizon divided by its horizon years, summed.</li>
        </ul>
      </S>
    </div>
  );
}
