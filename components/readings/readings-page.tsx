'use client';

import { useState } from 'react';
import useSWR from 'swr';
import { api, type EngineRow, type TruckRow, type WorkspaceView } from '@/components/fleet/types';
import { ApiError, fetcher, sendJson } from '@/lib/fetcher';

type Derived = {
  asOf: string;
  window: { from: string; to: string; months: number; askedMonths: number; readings: number } | null;
  annualHours: number | null;
  fuelBurnLitresPerHour: number | null;
  engineHours: { value: number; basis: 'since-overhaul' | 'since-repower' | 'meter'; since: string | null };
  repower: { month: string; date: string; engineTypeId: number | null } | null;
};
type Item = {
  truck: { id: number; unitNumber: string; version: number; engineTypeId: number; engineKey: string; engineHours: number; annualHours: number; fuelBurnLitresPerHour: number | null };
  readings: number;
  derived: Derived | null;
  offer: { engineHours?: number; annualHours?: number; fuelBurnLitresPerHour?: number; engineTypeId?: number; engineKey?: string } | null;
};
type Reading = {
  id: number; truckId: number; unitNumber: string; month: string; hourMeter: number; fuelLitres: number; tonnes: number | null;
  overhauls: number; failures: number; daysDown: number; repowerDate: string | null; repowerCost: number | null; repowerEngineKey: string | null; version: number;
};
type ImportAnswer = {
  fileName: string; ok: boolean; creates: number; replaces: number; rowProblems: Array<{ row: number; column: string; message: string }>;
  created?: number; replaced?: number; error?: string; problems?: Array<{ path: string; message: string }>;
};

const n0 = (v: number) => v.toLocaleString('en-US', { maximumFractionDigits: 0 });
const n1 = (v: number) => v.toLocaleString('en-US', { minimumFractionDigits: 1, maximumFractionDigits: 1 });
const basisText = (d: Derived) =>
  d.engineHours.basis === 'since-overhaul' ? `since the overhaul of ${d.engineHours.since}` : d.engineHours.basis === 'since-repower' ? `since the repower of ${d.engineHours.since}` : 'meter since new (no overhaul recorded in the readings)';

type Field = 'engineHours' | 'annualHours' | 'fuelBurnLitresPerHour' | 'engineTypeId';
/** The offered figures that differ from the register. */
function changes(item: Item): Field[] {
  const o = item.offer;
  if (!o) return [];
  const out: Field[] = [];
  if (o.engineHours !== undefined && o.engineHours !== item.truck.engineHours) out.push('engineHours');
  if (o.annualHours !== undefined && o.annualHours !== item.truck.annualHours) out.push('annualHours');
  if (o.fuelBurnLitresPerHour !== undefined && o.fuelBurnLitresPerHour !== item.truck.fuelBurnLitresPerHour) out.push('fuelBurnLitresPerHour');
  if (o.engineTypeId !== undefined && o.engineTypeId !== item.truck.engineTypeId) out.push('engineTypeId');
  return out;
}

function Pair({ register, derived, changed, testId }: { register: string; derived: string | null; changed: boolean; testId: string }) {
  return (
    <td className="n" data-testid={testId}>
      <div>{register}</div>
      {derived !== null ? <div className={changed ? 'text-xs font-medium text-accent' : 'text-xs text-muted'}>{derived} from readings</div> : null}
    </td>
  );
}

export function ReadingsPage({ ws, columns }: { ws: WorkspaceView; columns: Array<{ name: string; required: boolean; help: string }> }) {
  const [windowMonths, setWindowMonths] = useState(12);
  const derivedKey = `${api(ws.slug, 'readings/derived')}?window=${windowMonths}`;
  const { data, mutate } = useSWR<{ items: Item[] }>(derivedKey, fetcher);
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);
  const [truckId, setTruckId] = useState<number | null>(null);

  const accept = async (item: Item) => {
    const fields = changes(item);
    setMessage(null);
    try {
      await sendJson(api(ws.slug, `readings/trucks/${item.truck.id}/accept`), 'POST', { version: item.truck.version, windowMonths, fields });
      setMessage({ kind: 'ok', text: `${item.truck.unitNumber}: the register now holds the figures from readings as of ${item.derived!.asOf}.` });
    } catch (e) {
      const err = e as ApiError;
      setMessage({ kind: 'error', text: `${item.truck.unitNumber}: ${err.message} ${err.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}` });
    }
    await mutate();
  };

  const all = data?.items ?? [];
  const items = all.filter((it) => it.readings > 0);
  const without = all.length - items.length;
  return (
    <div className="space-y-4">
      <section className="card p-4">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <div>
            <h2 className="text-base font-semibold">The register from readings</h2>
            <p className="mt-1 max-w-3xl text-sm text-muted">
              Each truck&rsquo;s register figure, with the figure its readings give below it: annual hours and fuel burn over the chosen window
              (hours run × 12 ÷ months; litres ÷ hours run), engine hours from the latest meter reading. Nothing changes until you press
              &ldquo;Use these figures&rdquo;.
            </p>
          </div>
          <label className="text-sm">
            <span className="label">Window</span>
            <select className="field" value={windowMonths} onChange={(e) => setWindowMonths(Number(e.target.value))} aria-label="Window">
              {[3, 6, 12, 24].map((m) => <option key={m} value={m}>last {m} months</option>)}
            </select>
          </label>
        </div>
        {message ? <p role={message.kind === 'ok' ? 'status' : 'alert'} className={`mt-2 text-sm ${message.kind === 'ok' ? 'text-gain' : 'text-loss'}`} data-testid="accept-message">{message.text}</p> : null}
        <div className="mt-3 overflow-x-auto">
          <table className="data-table" data-testid="derived-table">
            <thead>
              <tr>
                <th>Unit</th><th className="n">Readings</th><th>As of, window</th><th className="n">Engine hours (h)</th><th className="n">Annual hours (h)</th>
                <th className="n">Fuel burn (L/h)</th><th>Engine type</th><th />
              </tr>
            </thead>
            <tbody>
              {items.map((it) => {
                const ch = changes(it);
                const d = it.derived;
                return (
                  <tr key={it.truck.id} data-testid={`derived-${it.truck.unitNumber}`}>
                    <td className="whitespace-nowrap font-mono text-xs"><button type="button" className="underline" onClick={() => setTruckId(it.truck.id)}>{it.truck.unitNumber}</button></td>
                    <td className="n">{it.readings}</td>
                    <td className="text-xs">
                      {d ? <>{d.asOf}{d.window ? <><br />{d.window.from} to {d.window.to} ({d.window.months} month{d.window.months === 1 ? '' : 's'})</> : <><br />one reading: no window</>}</> : <span className="text-muted">no readings</span>}
                    </td>
                    <Pair testId="engine-hours" register={n0(it.truck.engineHours)} derived={it.offer?.engineHours !== undefined ? `${n0(it.offer.engineHours)}` : null} changed={ch.includes('engineHours')} />
                    <Pair testId="annual-hours" register={n0(it.truck.annualHours)} derived={it.offer?.annualHours !== undefined ? n0(it.offer.annualHours) : null} changed={ch.includes('annualHours')} />
                    <Pair testId="fuel-burn" register={it.truck.fuelBurnLitresPerHour === null ? 'not measured' : n1(it.truck.fuelBurnLitresPerHour)} derived={it.offer?.fuelBurnLitresPerHour !== undefined ? n1(it.offer.fuelBurnLitresPerHour) : null} changed={ch.includes('fuelBurnLitresPerHour')} />
                    <td className="text-xs">
                      <div className="font-mono">{it.truck.engineKey}</div>
                      {d?.repower && it.offer?.engineKey ? <div className={ch.includes('engineTypeId') ? 'font-medium text-accent' : 'text-muted'}>{it.offer.engineKey}: repower of {d.repower.date}</div> : null}
                      {d ? <div className="text-muted">engine hours {basisText(d)}</div> : null}
                    </td>
                    <td className="whitespace-nowrap">
                      {ws.canEdit && ch.length ? (
                        <button type="button" className="btn" onClick={() => void accept(it)}>Use these figures</button>
                      ) : d && ch.length === 0 ? <span className="text-xs text-muted">register matches</span> : null}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        {data ? <p className="mt-2 text-xs text-muted" data-testid="without-readings">{items.length === 0 ? 'No truck has readings yet: import a file or type a month below.' : `${without} truck(s) without readings are not listed; choose one below to type its readings.`}</p> : null}
      </section>

      {ws.canEdit ? <ImportReadings ws={ws} columns={columns} onDone={() => void mutate()} /> : null}
      <TruckReadings ws={ws} truckId={truckId} setTruckId={setTruckId} onChange={() => void mutate()} />
    </div>
  );
}

function ImportReadings({ ws, columns, onDone }: { ws: WorkspaceView; columns: Array<{ name: string; required: boolean; help: string }>; onDone: () => void }) {
  const [file, setFile] = useState<File | null>(null);
  const [duplicates, setDuplicates] = useState<'refuse' | 'replace'>('refuse');
  const [answer, setAnswer] = useState<ImportAnswer | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const send = async (f: File, mode: 'preview' | 'commit', dup: 'refuse' | 'replace') => {
    const form = new FormData();
    form.set('file', f);
    form.set('mode', mode);
    form.set('duplicates', dup);
    setBusy(true);
    const res = await fetch(api(ws.slug, 'readings/import'), { method: 'POST', body: form });
    const body = (await res.json()) as ImportAnswer;
    setBusy(false);
    return { status: res.status, body };
  };
  const check = async (f: File | null, dup = duplicates) => {
    setFile(f);
    setAnswer(null);
    setFileError(null);
    setDone(null);
    if (!f) return;
    const r = await send(f, 'preview', dup);
    if (r.status === 200) setAnswer(r.body);
    else setFileError(r.body.problems?.map((p) => p.message).join(' ') || r.body.error || 'The file could not be read.');
  };
  const commit = async () => {
    if (!file) return;
    const r = await send(file, 'commit', duplicates);
    if (r.status === 200) {
      setDone(`Imported ${r.body.fileName}: ${r.body.created} reading(s) added, ${r.body.replaced} replaced.`);
      setAnswer(null);
      onDone();
    } else if (r.body.rowProblems) setAnswer(r.body);
    else setFileError(r.body.error ?? 'The import failed.');
  };

  return (
    <section className="card p-4" data-testid="readings-import">
      <h2 className="text-base font-semibold">Import readings</h2>
      <p className="mt-1 max-w-3xl text-sm text-muted">
        One row per truck and month (CSV in UTF-8 or XLSX; 5 MB and 10,000 rows at most), checked row by row and saved all or nothing. A meter reading lower
        than the month before (except in a repower month), a month in the future, an unknown unit number or a month twice are row errors.
      </p>
      <p className="mt-2 text-sm" data-testid="readings-template">
        Template (the import&rsquo;s columns, header only):{' '}
        <a className="text-accent underline" href={`${api(ws.slug, 'readings/template')}?format=xlsx`} download>XLSX, with a sheet explaining each column</a>{' '}
        or <a className="text-accent underline" href={`${api(ws.slug, 'readings/template')}?format=csv`} download>CSV</a>
      </p>
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer text-muted">Columns</summary>
        <table className="data-table mt-1">
          <thead><tr><th>Column</th><th>Required</th><th>What it holds</th></tr></thead>
          <tbody>{columns.map((c) => <tr key={c.name}><td className="font-mono text-xs">{c.name}</td><td>{c.required ? 'yes' : 'no'}</td><td>{c.help}</td></tr>)}</tbody>
        </table>
      </details>
      <fieldset className="mt-3 text-sm">
        <legend className="label">Months already saved for a truck</legend>
        <label className="mr-4"><input type="radio" name="duplicates" checked={duplicates === 'refuse'} onChange={() => { setDuplicates('refuse'); if (file) void check(file, 'refuse'); }} /> refuse them (row errors)</label>
        <label><input type="radio" name="duplicates" checked={duplicates === 'replace'} onChange={() => { setDuplicates('replace'); if (file) void check(file, 'replace'); }} /> replace them with the file&rsquo;s</label>
      </fieldset>
      <label htmlFor="readings-file" className="label mt-2">Readings file (.csv or .xlsx)</label>
      <input id="readings-file" type="file" accept=".csv,.xlsx" className="text-sm" onChange={(e) => { void check(e.target.files?.[0] ?? null); e.target.value = ''; }} />
      {busy ? <p className="mt-2 text-sm text-muted">Working…</p> : null}
      {fileError ? <p role="alert" className="mt-2 text-sm text-loss">{fileError} Nothing was saved.</p> : null}
      {done ? <p role="status" className="mt-2 text-sm text-gain" data-testid="readings-import-done">{done}</p> : null}
      {answer ? (
        <div className="mt-3" data-testid="readings-preview">
          <p className="text-sm">
            <span className="font-medium">{answer.fileName}</span>: {answer.creates} reading(s) to add, {answer.replaces} to replace
            {answer.rowProblems.length ? <>, <span className="text-loss">{answer.rowProblems.length} problem(s) to fix first; nothing will be saved</span></> : null}.
            Row numbers are the file&rsquo;s own; the header is row 1.
          </p>
          {answer.rowProblems.length ? (
            <table className="data-table mt-2" data-testid="readings-problems">
              <thead><tr><th className="n">Row</th><th>Column</th><th>Problem</th></tr></thead>
              <tbody>{answer.rowProblems.slice(0, 500).map((p, i) => <tr key={i}><td className="n">{p.row}</td><td className="font-mono text-xs">{p.column}</td><td>{p.message}</td></tr>)}</tbody>
            </table>
          ) : (
            <button type="button" className="btn btn-primary mt-2" disabled={busy} onClick={() => void commit()}>Import {answer.creates + answer.replaces} reading(s)</button>
          )}
        </div>
      ) : null}
    </section>
  );
}

const EMPTY = { month: '', hourMeter: '', fuelLitres: '', tonnes: '', overhauls: '0', failures: '0', daysDown: '0', repowerDate: '', repowerCost: '', repowerEngineTypeId: '' };

function TruckReadings({ ws, truckId, setTruckId, onChange }: { ws: WorkspaceView; truckId: number | null; setTruckId: (id: number) => void; onChange: () => void }) {
  const { data: trucks } = useSWR<{ items: TruckRow[] }>(api(ws.slug, 'trucks'), fetcher);
  const { data: engines } = useSWR<{ items: EngineRow[] }>(api(ws.slug, 'engines'), fetcher);
  const key = truckId ? `${api(ws.slug, 'readings')}?truck=${truckId}` : null;
  const { data: readings, mutate } = useSWR<{ items: Reading[] }>(key, fetcher);
  const [v, setV] = useState(EMPTY);
  const [problems, setProblems] = useState<Array<{ path: string; message: string }>>([]);
  const [saved, setSaved] = useState<string | null>(null);

  const num = (s: string) => (s.trim() === '' ? null : Number(s));
  const save = async () => {
    setProblems([]);
    setSaved(null);
    try {
      await sendJson(api(ws.slug, 'readings'), 'POST', {
        truckId, month: v.month, hourMeter: num(v.hourMeter), fuelLitres: num(v.fuelLitres), tonnes: num(v.tonnes), overhauls: num(v.overhauls) ?? 0,
        failures: num(v.failures) ?? 0, daysDown: num(v.daysDown) ?? 0, repowerDate: v.repowerDate || null, repowerCost: num(v.repowerCost),
        repowerEngineTypeId: v.repowerEngineTypeId ? Number(v.repowerEngineTypeId) : null,
      });
      setSaved(`Saved the reading of ${v.month}.`);
      setV(EMPTY);
      await mutate();
      onChange();
    } catch (e) {
      const err = e as ApiError;
      setProblems(err.problems.length ? err.problems : [{ path: '', message: err.message }]);
    }
  };
  const remove = async (r: Reading) => {
    await sendJson(`${api(ws.slug, `readings/${r.id}`)}?version=${r.version}`, 'DELETE');
    await mutate();
    onChange();
  };
  const field = (name: keyof typeof EMPTY, label: string, type = 'text') => (
    <label className="text-sm">
      <span className="label">{label}</span>
      <input className="field w-32" type={type} value={v[name]} onChange={(e) => setV({ ...v, [name]: e.target.value })} aria-label={label} />
    </label>
  );

  return (
    <section className="card p-4" data-testid="truck-readings">
      <h2 className="text-base font-semibold">A truck&rsquo;s readings</h2>
      <label className="text-sm">
        <span className="label">Truck</span>
        <select className="field w-60" value={truckId ?? ''} onChange={(e) => setTruckId(Number(e.target.value))} aria-label="Truck">
          <option value="" disabled>Choose a truck</option>
          {(trucks?.items ?? []).map((t) => <option key={t.id} value={t.id}>{t.unitNumber}</option>)}
        </select>
      </label>
      {truckId ? (
        <>
          <table className="data-table mt-3">
            <thead>
              <tr><th>Month</th><th className="n">Meter (h)</th><th className="n">Fuel (L)</th><th className="n">Tonnes (t)</th><th className="n">Overhauls</th><th className="n">Failures</th><th className="n">Days down</th><th>Repower</th>{ws.canEdit ? <th /> : null}</tr>
            </thead>
            <tbody>
              {(readings?.items ?? []).map((r) => (
                <tr key={r.id}>
                  <td>{r.month}</td><td className="n">{n0(r.hourMeter)}</td><td className="n">{n0(r.fuelLitres)}</td><td className="n">{r.tonnes === null ? '—' : n0(r.tonnes)}</td>
                  <td className="n">{r.overhauls}</td><td className="n">{r.failures}</td><td className="n">{r.daysDown}</td>
                  <td className="text-xs">{r.repowerDate ? `${r.repowerDate}${r.repowerEngineKey ? `, ${r.repowerEngineKey}` : ''}${r.repowerCost !== null ? `, ${n0(r.repowerCost)} ${ws.currency}` : ''}` : ''}</td>
                  {ws.canEdit ? <td><button type="button" className="btn" onClick={() => void remove(r)} aria-label={`Delete the reading of ${r.month}`}>Delete</button></td> : null}
                </tr>
              ))}
            </tbody>
          </table>
          {readings && readings.items.length === 0 ? <p className="mt-2 text-sm text-muted">No readings yet.</p> : null}
          {ws.canEdit ? (
            <div className="mt-3">
              <h3 className="text-sm font-semibold">Add a month</h3>
              <div className="mt-1 flex flex-wrap gap-3">
                {field('month', 'Month (YYYY-MM)')}
                {field('hourMeter', 'Hour meter (h)')}
                {field('fuelLitres', 'Fuel (L)')}
                {field('tonnes', 'Tonnes (t)')}
                {field('overhauls', 'Overhauls')}
                {field('failures', 'Failures')}
                {field('daysDown', 'Days down')}
                {field('repowerDate', 'Repower date (YYYY-MM-DD)')}
                {field('repowerCost', `Repower cost (${ws.currency})`)}
                <label className="text-sm">
                  <span className="label">Engine fitted</span>
                  <select className="field" value={v.repowerEngineTypeId} onChange={(e) => setV({ ...v, repowerEngineTypeId: e.target.value })} aria-label="Engine fitted">
                    <option value="">none</option>
                    {(engines?.items ?? []).map((e) => <option key={e.id} value={e.id}>{e.key}</option>)}
                  </select>
                </label>
              </div>
              <button type="button" className="btn btn-primary mt-2" onClick={() => void save()}>Save reading</button>
              {saved ? <p role="status" className="mt-2 text-sm text-gain">{saved}</p> : null}
              {problems.length ? <ul role="alert" className="mt-2 text-sm text-loss">{problems.map((p, i) => <li key={i}>{p.path ? `${p.path}: ` : ''}{p.message}</li>)}</ul> : null}
            </div>
          ) : null}
        </>
      ) : null}
    </section>
  );
}
