'use client';

import Link from 'next/link';
import { useState } from 'react';
import useSWR from 'swr';
import { ApiError, fetcher, sendJson } from '@/lib/fetcher';
import { formatNumber } from '@/lib/format';
import type { ReforecastField, ReforecastPreview, ReforecastTruck } from '@/lib/db/queries/reforecast';

const WINDOWS = [3, 6, 12, 24];

const windowText = (t: ReforecastTruck) => {
  const r = t.fromReadings;
  if (!r) return 'no readings';
  if (!r.window) return `${r.asOf}, one reading: no window`;
  return `${r.asOf}; ${r.window.from} to ${r.window.to} (${r.window.months} month${r.window.months === 1 ? '' : 's'})`;
};

function Figure({ t, field, caseText, readingText, nextText }: { t: ReforecastTruck; field: ReforecastField; caseText: string; readingText: string | null; nextText: string }) {
  const changed = t.changes.includes(field);
  return (
    <td className="n" data-testid={`reforecast-${field}`} data-changed={changed ? 'yes' : 'no'}>
      <div className={changed ? 'text-muted line-through' : ''}>{caseText}</div>
      {changed ? <div className="font-medium text-accent" data-testid="next">{nextText}</div> : null}
      {!changed && readingText !== null && readingText !== caseText ? <div className="text-xs text-muted">{readingText} from readings (not used)</div> : null}
    </td>
  );
}

const burnText = (v: number | null | undefined) => (v === null || v === undefined ? 'engine model' : formatNumber(v, 1));

/**
 * Re-forecast on an approved case's plan-against-actual page: per truck the
 * approved case's figures against those its readings give (struck through
 * where they change), and "Start re-forecast case", which makes the new draft
 * and links to it. For whoever may create cases.
 */
export function ReforecastPanel({ slug, caseId }: { slug: string; caseId: number }) {
  const [windowMonths, setWindowMonths] = useState(12);
  const url = `/api/workspaces/${slug}/cases/${caseId}/reforecast`;
  const { data, error } = useSWR<ReforecastPreview>(`${url}?window=${windowMonths}`, fetcher);
  const [created, setCreated] = useState<{ id: number; name: string } | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const start = async () => {
    setBusy(true);
    setProblem(null);
    try {
      const r = await sendJson<{ case: { id: number; name: string } }>(url, 'POST', { windowMonths });
      setCreated(r.case);
    } catch (e) {
      const err = e as ApiError;
      setProblem(`${err.message}${err.problems.length ? ` ${err.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}` : ''}`);
    }
    setBusy(false);
  };

  const changing = data?.trucks.filter((t) => t.changes.length > 0).length ?? 0;
  return (
    <section className="card mt-4 p-4" data-testid="reforecast-panel" aria-labelledby="reforecast-heading">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="reforecast-heading" className="text-base font-semibold">Re-forecast: a new case from the readings</h2>
          <p className="mt-1 max-w-3xl text-sm text-muted">
            A new draft with this case&rsquo;s trucks, offers, assumption set and plan settings, each truck&rsquo;s engine hours, annual hours, measured
            fuel burn (where the case uses one) and engine type taken from its readings, as the register page derives them over the window. A truck
            without readings keeps the case&rsquo;s figures. The register and this approved case do not change.
          </p>
        </div>
        <label className="text-sm">
          <span className="label">Window</span>
          <select className="field" value={windowMonths} onChange={(e) => { setWindowMonths(Number(e.target.value)); setCreated(null); }} aria-label="Re-forecast window">
            {WINDOWS.map((m) => <option key={m} value={m}>last {m} months</option>)}
          </select>
        </label>
      </div>
      {error ? <p role="alert" className="mt-2 text-sm text-loss">{(error as ApiError).message}</p> : null}
      {data ? (
        <>
          <p className="mt-2 text-sm" data-testid="reforecast-summary">
            {data.lastReading === null
              ? 'None of this case\u2019s trucks has readings yet: there is nothing to re-forecast from.'
              : `Readings to ${data.lastReading}: ${changing} of ${data.trucks.length} trucks change, ${data.withoutReadings} without readings keep the case's figures. The new case's plan starts in ${data.planStartMonth.next} (this one's started in ${data.planStartMonth.current}).`}
          </p>
          <div className="mt-3 max-h-[32rem] overflow-auto">
            <table className="data-table" data-testid="reforecast-table">
              <thead>
                <tr>
                  <th>Unit</th><th>Readings as of, window</th><th className="n">Engine hours (h)</th><th className="n">Annual hours (h)</th>
                  <th className="n">Fuel burn (L/h)</th><th>Engine type</th><th>Note</th>
                </tr>
              </thead>
              <tbody>
                {data.trucks.map((t) => (
                  <tr key={t.unitNumber} data-testid={`reforecast-${t.unitNumber}`}>
                    <td className="whitespace-nowrap font-mono text-xs">{t.unitNumber}</td>
                    <td className="text-xs">{windowText(t)}</td>
                    <Figure t={t} field="engineHours" caseText={formatNumber(t.case.engineHours)} readingText={t.fromReadings?.engineHours !== undefined ? formatNumber(t.fromReadings.engineHours) : null} nextText={formatNumber(t.next.engineHours)} />
                    <Figure t={t} field="annualHours" caseText={formatNumber(t.case.annualHours)} readingText={t.fromReadings?.annualHours !== undefined ? formatNumber(t.fromReadings.annualHours) : null} nextText={formatNumber(t.next.annualHours)} />
                    <Figure t={t} field="fuelBurnLitresPerHour" caseText={burnText(t.case.fuelBurnLitresPerHour)} readingText={t.fromReadings?.fuelBurnLitresPerHour !== undefined ? burnText(t.fromReadings.fuelBurnLitresPerHour) : null} nextText={burnText(t.next.fuelBurnLitresPerHour)} />
                    <td className="text-xs" data-testid="reforecast-engine" data-changed={t.changes.includes('engine') ? 'yes' : 'no'}>
                      <div className={`font-mono ${t.changes.includes('engine') ? 'text-muted line-through' : ''}`}>{t.case.engineKey}</div>
                      {t.changes.includes('engine') ? <div className="font-mono font-medium text-accent">{t.next.engineKey}</div> : null}
                    </td>
                    <td className="max-w-xs text-xs" data-testid="reforecast-note">{t.changes.length === 0 && !t.note ? 'no change' : t.note}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="mt-3 flex flex-wrap items-center gap-3">
            <button type="button" className="btn btn-primary" disabled={busy || data.lastReading === null || created !== null} onClick={() => void start()}>
              Start re-forecast case
            </button>
            {busy ? <span className="text-sm text-muted">Creating…</span> : null}
            {created ? (
              <p role="status" className="text-sm text-gain" data-testid="reforecast-created">
                Created the draft{' '}
                <Link className="text-accent underline" href={`/${slug}/cases/${created.id}`} data-testid="reforecast-open">{created.name}</Link>.
              </p>
            ) : null}
            {problem ? <p role="alert" className="text-sm text-loss">{problem} Nothing was saved.</p> : null}
          </div>
        </>
      ) : null}
    </section>
  );
}
