'use client';

import { parseNumberText, type NumberFormat } from '@/lib/number-input';
import { MONTH_NAMES, periodMonths, periodName } from '@/lib/plan/fiscal-year';
import { monthLabel } from '@/lib/plan/schedule';
import { capacityLabel } from '@/lib/plan/settings-input';

/**
 * The shop's swaps month by month: one field per month in which the
 * programme can plan a swap (`formExtent`), a row per plan period. An empty field takes the default (swaps
 * per month, shown greyed); a month set to 0 is a shutdown and is marked so;
 * a month that differs from the default is marked as changed. Only those
 * months are saved (the form reads the text with `readPlanForm`).
 */
export function CapacityGrid({
  months,
  startMonth,
  fiscalYearStartMonth,
  defaultText,
  values,
  onChange,
  errorOf,
  disabled,
  format,
}: {
  months: number;
  startMonth: string;
  fiscalYearStartMonth: number;
  /** the default capacity as typed (swaps per month) */
  defaultText: string;
  /** the text of each month, by month index; missing or empty = the default */
  values: Record<string, string>;
  onChange: (month: number, text: string) => void;
  /** the problem shown for a month's field, '' for none */
  errorOf: (month: number) => string;
  disabled: boolean;
  format: NumberFormat;
}) {
  const parsedDefault = parseNumberText(defaultText, format, { integer: true });
  const fallback = parsedDefault.ok ? parsedDefault.value : null;
  const rows = Array.from({ length: Math.ceil(months / 12) }, (_, r) => r);
  return (
    <fieldset className="space-y-1" data-testid="capacity-grid">
      <legend className="label">Shop capacity by month (swaps; empty = {fallback ?? 'the default'}, 0 = shutdown)</legend>
      <div className="overflow-x-auto">
        <table className="text-xs">
          <thead>
            <tr>
              <th className="pr-2 text-left font-normal text-muted">Period</th>
              {Array.from({ length: Math.min(12, months) }, (_, c) => (
                <th key={c} className="px-0.5 text-center font-normal text-muted">{MONTH_NAMES[Number(monthLabel(startMonth, c).slice(5)) - 1].slice(0, 3)}</th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => {
              const cells = Array.from({ length: 12 }, (_, c) => 12 * r + c).filter((m) => m < months);
              const problems = cells.map((m) => errorOf(m)).filter(Boolean);
              return [
                <tr key={`r${r}`}>
                  <th scope="row" className="whitespace-nowrap pr-2 text-left font-normal" title={periodMonths(startMonth, r + 1)}>
                    {periodName(startMonth, r + 1, fiscalYearStartMonth)}
                  </th>
                  {cells.map((m) => {
                    const label = monthLabel(startMonth, m);
                    const text = values[String(m)] ?? '';
                    const read = parseNumberText(text, format, { integer: true, min: 0 });
                    const value = read.ok ? read.value : null;
                    const shutdown = value === 0;
                    const changed = value !== null && value !== fallback;
                    const err = errorOf(m);
                    return (
                      <td key={m} className="px-0.5 py-0.5 align-top">
                        <div
                          title={shutdown ? `${label}: shutdown, no swaps` : changed ? `${label}: ${value} swaps, not the usual ${fallback ?? ''}` : `${label}: the usual capacity`}
                          className={`rounded border p-0.5 text-center ${shutdown ? 'border-caution-rule bg-caution-ground' : changed ? 'border-accent' : 'border-transparent'}`}
                          data-testid={`capacity-cell-${label}`}
                          data-state={shutdown ? 'shutdown' : changed ? 'changed' : 'default'}
                        >
                          <input
                            aria-label={capacityLabel(label)}
                            inputMode="numeric"
                            className="field w-11 px-1 text-right tabular-nums"
                            placeholder={fallback === null ? '' : String(fallback)}
                            disabled={disabled}
                            value={text}
                            onChange={(e) => onChange(m, e.target.value)}
                            aria-invalid={!!err}
                            aria-describedby={err ? `capacity-errors-${r}` : undefined}
                          />
                          {shutdown ? <span className="block font-semibold text-caution" data-testid={`capacity-note-${label}`}>shutdown</span> : null}
                        </div>
                      </td>
                    );
                  })}
                </tr>,
                problems.length ? (
                  <tr key={`e${r}`}>
                    <td />
                    <td colSpan={12} id={`capacity-errors-${r}`} className="text-loss" aria-live="polite">{problems.join('; ')}</td>
                  </tr>
                ) : null,
              ];
            })}
          </tbody>
        </table>
      </div>
    </fieldset>
  );
}
