import { formatYears } from '@/lib/format';
import { paybackBlankReason, paybackWarning, type PaybackHold } from '@/lib/cases/payback';

/**
 * A payback as shown in tables and on the truck page: "—" with the reason when there is no investment
 * or no payback, the figure with a "does not hold" flag when the running sum goes below zero again.
 */
export function PaybackFigure({ years, hold }: { years: number | null; hold: PaybackHold }) {
  const blank = paybackBlankReason(hold);
  if (blank) {
    const short = hold.kind === 'no-investment' ? 'no investment' : 'none';
    return (
      <span title={blank} className="text-muted" data-testid="payback-blank">
        — <span className="text-[10px]">({short})</span>
      </span>
    );
  }
  const warning = paybackWarning(hold);
  return (
    <span title={warning ?? undefined} data-testid={warning ? 'payback-flagged' : 'payback'}>
      {formatYears(years)}
      {warning ? <> <span className="text-[10px] font-semibold text-loss">does not hold</span></> : null}
    </span>
  );
}
