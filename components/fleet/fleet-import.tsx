'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useSWRConfig } from 'swr';
import type { ImportColumn } from '@/lib/import/columns';
import { api, type WorkspaceView } from './types';

type Preview = {
  fileName: string; ok: boolean; creates: number; updates: number;
  rowProblems: Array<{ row: number; column: string; message: string }>;
  rows: Array<{ row: number; unitNumber: string; action: 'create' | 'update' }>;
  created?: number; updated?: number; error?: string; problems?: Array<{ path: string; message: string }>;
};

async function send(slug: string, file: File, mode: 'preview' | 'commit'): Promise<{ status: number; body: Preview }> {
  const form = new FormData();
  form.set('file', file);
  form.set('mode', mode);
  const res = await fetch(api(slug, 'fleet/import'), { method: 'POST', body: form });
  return { status: res.status, body: await res.json() };
}

/** Choose a file, see every row's problems and what will change, then import all of it or nothing. */
export function FleetImport({ ws, columns }: { ws: WorkspaceView; columns: ImportColumn[] }) {
  const { mutate } = useSWRConfig();
  const [file, setFile] = useState<File | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const check = async (f: File | null) => {
    setFile(f);
    setPreview(null);
    setFileError(null);
    setDone(null);
    if (!f) return;
    setBusy(true);
    const r = await send(ws.slug, f, 'preview');
    setBusy(false);
    if (r.status === 200) setPreview(r.body);
    else setFileError(r.body.problems?.map((p) => p.message).join(' ') || r.body.error || 'The file could not be read.');
  };
  const commit = async () => {
    if (!file) return;
    setBusy(true);
    const r = await send(ws.slug, file, 'commit');
    setBusy(false);
    if (r.status === 200) {
      setDone(`Imported ${r.body.fileName}: ${r.body.created} truck(s) added, ${r.body.updated} updated.`);
      setPreview(null);
      await mutate(api(ws.slug, 'trucks'));
    } else if (r.body.rowProblems) setPreview(r.body);
    else setFileError(r.body.error ?? 'The import failed.');
  };

  return (
    <div className="space-y-4">
      <section className="card p-4">
        <h2 className="text-base font-semibold">1. Start from the template</h2>
        <p className="mt-1 text-sm text-muted">
          One row per truck; the header row names the columns. A unit number already in the register updates that truck. Limits: 5 MB and 10,000 rows.
          Text that starts with =, +, - or @ is refused (a spreadsheet would read it as a formula).
        </p>
        <div className="mt-2 flex gap-2">
          <a className="btn" href={`${api(ws.slug, 'fleet/template')}?format=xlsx`} download>Download XLSX template</a>
          <a className="btn" href={`${api(ws.slug, 'fleet/template')}?format=csv`} download>Download CSV template</a>
        </div>
        <details className="mt-2 text-sm">
          <summary className="cursor-pointer text-muted">Columns</summary>
          <table className="data-table mt-1">
            <thead><tr><th>Column</th><th>Required</th><th>What it holds</th></tr></thead>
            <tbody>{columns.map((c) => <tr key={c.name}><td className="font-mono text-xs">{c.name}</td><td>{c.required ? 'yes' : 'no'}</td><td>{c.help}</td></tr>)}</tbody>
          </table>
        </details>
      </section>

      <section className="card p-4">
        <h2 className="text-base font-semibold">2. Check the file</h2>
        <label htmlFor="fleet-file" className="label mt-2">Fleet file (.csv or .xlsx)</label>
        <input id="fleet-file" type="file" accept=".csv,.xlsx" className="text-sm" onChange={(e) => {
            void check(e.target.files?.[0] ?? null);
            // Cleared so that choosing the same file again, once fixed, checks it again.
            e.target.value = '';
          }} />
        {busy ? <p className="mt-2 text-sm text-muted">Working…</p> : null}
        {fileError ? <p role="alert" className="mt-2 text-sm text-loss" data-testid="import-file-error">{fileError} Nothing was saved.</p> : null}
        {done ? <p role="status" className="mt-2 text-sm text-gain" data-testid="import-done">{done} <Link className="underline" href={`/${ws.slug}/fleet`}>Back to the register</Link></p> : null}
      </section>

      {preview ? (
        <section className="card p-4" data-testid="import-preview">
          <h2 className="text-base font-semibold">3. Review and import</h2>
          <p className="mt-1 text-sm">
            <span className="font-medium">{preview.fileName}</span>: {preview.creates} truck(s) to add, {preview.updates} to update
            {preview.rowProblems.length ? <>, <span className="text-loss">{preview.rowProblems.length} problem(s) to fix first</span></> : null}.
            Row numbers are the file&rsquo;s own; the header is row 1.
          </p>
          {preview.rowProblems.length ? (
            <table className="data-table mt-2" data-testid="import-problems">
              <thead><tr><th className="n">Row</th><th>Column</th><th>Problem</th></tr></thead>
              <tbody>{preview.rowProblems.map((p, i) => <tr key={i}><td className="n">{p.row}</td><td className="font-mono text-xs">{p.column}</td><td>{p.message}</td></tr>)}</tbody>
            </table>
          ) : (
            <>
              <table className="data-table mt-2" data-testid="import-plan">
                <thead><tr><th className="n">Row</th><th>Unit</th><th>Action</th></tr></thead>
                <tbody>{preview.rows.slice(0, 200).map((r) => <tr key={r.row}><td className="n">{r.row}</td><td className="font-mono text-xs">{r.unitNumber}</td><td>{r.action === 'create' ? 'add' : 'update'}</td></tr>)}</tbody>
              </table>
              {preview.rows.length > 200 ? <p className="text-xs text-muted">…and {preview.rows.length - 200} more rows.</p> : null}
              <button type="button" className="btn btn-primary mt-3" disabled={busy} onClick={commit}>Import {preview.rows.length} truck(s)</button>
            </>
          )}
        </section>
      ) : null}
    </div>
  );
}
