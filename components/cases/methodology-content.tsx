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
        <p>The proposal is the case&rsquo;s answer, the fleet programme&rsquo;s (section 13): each truck takes the timing the programme chose within the budgets and the shop&rsquo;s capacity — repowered now, at a planned overhaul or some months late, or kept, or rebuilt. Its gain is Σ over trucks of NPV(its policy) − NPV(rebuild); its IRR, MIRR, payback and discounted payback are those of the summed cash flow of the proposal less that of rebuilding every engine, by the same rules as a truck&rsquo;s. The unconstrained best mix and repowering every truck are shown beside it as comparisons. The drivers that swing it most are a ±20 % tornado on its gain with each truck kept on its proposed policy. Fiscal years are named after the calendar year they end in (with a July start, July 2026 – June 2027 is FY2027); a plan period of 12 months is named by the fiscal year its first month falls in.</p>
      </S>
      <S id="plan" title="13. Fleet programme and ranking">
        <p>Trucks are ranked by the gain of repowering (ΔNPV against the better other policy), then by PI; the ranking is for reading, the proposal comes from the fleet programme.</p>
        <p>The fleet programme chooses one timing per truck: keep, rebuild (never repower), repower now, or repower at the k-th planned overhaul of the engine fitted today (k = 1, 2, 3 while it falls within the horizon), possibly 1 to the plan&rsquo;s most months late (the old engine runs on past its planned life; a failure first brings the swap forward). Each timing is valued in expectation like the case&rsquo;s own policies. The programme maximises the fleet&rsquo;s expected NPV with the planned capital of each period (the year of the planned swap, at that year&rsquo;s prices) within its budget and at most the shop&rsquo;s swaps in each month (a month can be set to 0 for a shutdown). It is solved exactly as a mixed-integer linear programme. A budget that binds is re-solved with 1,000,000 more, and a full month with one more swap, to show what one more unit would gain.</p>
        <p>Each planned swap is shown in its planned month beside the month it is due: the month the current engine reaches its planned life with no failure before it (now for an engine at or past its life). A truck whose best timing no budget allows, and for which no other timing pays, is left out with the gain it forgoes. A period with no budget is not limited.</p>
      </S>
    </div>
  );
}
