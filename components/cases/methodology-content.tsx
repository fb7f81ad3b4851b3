import type { ReactNode } from 'react';

const F = ({ children }: { children: ReactNode }) => <code className="rounded bg-paper px-1 font-mono text-[0.8rem]">{children}</code>;
const S = ({ id, title, children }: { id: string; title: string; children: ReactNode }) => (
  <section id={id} aria-labelledby={`${id}-h`} className="card space-y-2 p-4 text-sm leading-relaxed">
    <h2 id={`${id}-h`} className="text-base font-semibold">{title}</h2>
    {children}
  </section>
);

/**
 * The planning pages' part of the methodology (the engine's part is rendered
 * from docs/methodology.md): how results are compared, ranked, planned and scheduled.
 */
export function PlanningMethodology() {
  return (
    <div className="space-y-4">
      <S id="results-pages" title="12. Reading the results pages">
        <p>On the results page repower is compared with each truck&rsquo;s <em>better other policy</em> (the higher NPV of keep and rebuild, ties to rebuild): ΔNPV, IRR, MIRR, payback, discounted payback and PI in the truck table are the engine&rsquo;s figures for that comparison. When IRR is blank the cell says why: no investment (Δ cash flow never changes sign, or starts positive), several sign changes (read MIRR), or no rate between −99 % and 1,000 %. Fuel L/h and cost per hour and per tonne are those of the truck&rsquo;s best policy. Money is in the workspace currency, in thousands where the header says <F>k</F>, negatives in parentheses.</p>
        <p>Fleet fuel and CO2 saved a year against rebuilding everything: for each truck, (rebuild − best policy) over its horizon divided by its horizon years, summed over the fleet. The comparison &ldquo;capital of the unconstrained best mix&rdquo;: the repower capital of the trucks whose best policy is repower, by the fiscal year it is spent, undiscounted.</p>
        <p>The proposal is the case&rsquo;s answer: the trucks its saved plan chooses within the budgets are repowered, every other truck keeps or rebuilds its engine, whichever costs less. Its gain is Σ over trucks of NPV(its policy) − NPV(rebuild); its IRR, MIRR, payback and discounted payback are those of the summed cash flow of the proposal less that of rebuilding every engine, by the same rules as a truck&rsquo;s. The unconstrained best mix and repowering every truck are shown beside it as comparisons. The drivers that swing it most are a ±20 % tornado on its gain with each truck kept on its proposed policy. Fiscal years are named after the calendar year they end in (with a July start, July 2026 – June 2027 is FY2027); a plan period of 12 months is named by the fiscal year its first month falls in.</p>
      </S>
      <S id="plan" title="13. Ranking, capital plan and schedule">
        <p>Trucks are ranked by the gain of repowering (ΔNPV against the better other policy), then by PI. For each year in which repower capital is spent, the plan chooses the set of repowers with the largest total gain whose capital fits that year&rsquo;s budget. This is a 0/1 knapsack solved exactly by dynamic programming on money in whole thousands: each cost is rounded up and the budget down to a thousand, so a chosen set never exceeds the budget, and no other set within that resolution gains more. Picking by highest PI first can lose: with a 10 M budget, one 6 M repower of PI 2.2 blocks two 5 M repowers of PI 2.1 that together gain more. For each repower left out the plan shows the extra budget needed to add it to the chosen set (its capital less what is left unspent). A year with no budget is not limited; a repower that does not gain is never chosen.</p>
        <p>Each chosen swap is scheduled in the month it is due. With the expected valuation that is the planned repower: the month the current engine reaches its planned life with no failure before it (the hours to go, life − engine hours, at the truck&rsquo;s annual hours; booked in the year whose hours hold it, the year&rsquo;s last hour included, as events are), or month 0 for a repower now or an engine at or past its life. Its capital is planned in that year, although the expected spend is spread over the years before it too (the chance that a failure brings the swap forward); a swap whose planned life lies beyond the horizon, which only a failure would bring, is due at the start of the first year with expected spend. On the median path it is the month of the repower on that path (at the planned life, or at the median failure age when that comes first). At most the set number of swaps fit in a month; larger gains keep their month, and an excess swap moves to the nearest earlier month with room and is flagged. If no earlier month has room it goes to the next month with room, flagged as late.</p>
      </S>
    </div>
  );
}
