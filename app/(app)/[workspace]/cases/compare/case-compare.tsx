'use client';

import { usePathname, useRouter } from 'next/navigation';
import { useState } from 'react';
import useSWR from 'swr';
import type { CaseComparison, InputChange, ResultChange, Value } from '@/lib/cases/compare';
import type { CaseSummaryDto } from '@/lib/cases/types';
import type { ApiError } from '@/lib/fetcher';
import { formatMoney } from '@/lib/format';

/** Rows shown before "Show all" (the CSV holds every change). */
const FIRST_ROWS = 100;

const plain = new Intl.NumberFormat('en-US', { maximumFractionDigits: 6 });
const signed = new Intl.NumberFormat('en-US', { maximumFractionDigits: 6, signDisplay: 'exceptZero' });

function inputValue(v: Value): string {
  if (v === null) return '—';
  return typeof v === 'number' ? plain.format(v) : v;
}

function inputChange(c: InputChange): string {
  if (c.change !== null) return `${signed.format(c.change)}${c.unit.startsWith('%') ? ' pp' : ''}`;
  if (c.a === null) return 'only in B';
  if (c.b === null) return 'only in A';
  return 'changed';
}

const money = (v: Value) => (typeof v === 'number' ? formatMoney(v) : v === null ? '—' : v);

function resultChange(r: ResultChange): string {
  if (r.change !== null) return `${r.change > 0 ? '+' : ''}${formatMoney(r.change, { negative: 'minus' })}`;
  if (r.a === null) return 'only in B';
  if (r.b === null) return 'only in A';
  return 'changed';
}

function CasePicker({ label, cases, value, onChange }: { label: string; cases: CaseSummaryDto[]; value: number | null; onChange: (id: number | null) => void }) {
  return (
    <label className="min-w-64">
      <span className="label">{label}</span>
      <select className="field" value={value ?? ''} onChange={(e) => onChange(e.target.value ? Number(e.target.value) : null)}>
        <option value="">Choose a case…</option>
        {cases.map((c) => (
          <option key={c.id} value={c.id}>{c.name} (#{c.id}, {c.status})</option>
        ))}
      </select>
    </label>
  );
}

function ShowAll({ total, open, onOpen }: { total: number; open: boolean; onOpen: () => void }) {
  if (total <= FIRST_ROWS || open) return null;
  return (
    <p className="p-2 text-sm text-muted">
      Showing the {FIRST_ROWS} largest of {total.toLocaleString('en-US')} changes.{' '}
      <button type="button" className="text-accent underline" onClick={onOpen}>Show all</button>
    </p>
  );
}

function Changes({ data }: { data: CaseComparison }) {
  const [allInputs, setAllInputs] = useState(false);
  const [allResults, setAllResults] = useState(false);
  const inputs = allInputs ? data.inputs : data.inputs.slice(0, FIRST_ROWS);
  const results = allResults ? data.results : data.results.slice(0, FIRST_ROWS);
  const a = `A: ${data.a.name}`;
  const b = `B: ${data.b.name}`;
  return (
    <div className="space-y-4">
      <section className="card overflow-x-auto" aria-labelledby="input-changes">
        <h2 id="input-changes" className="p-3 text-base font-semibold">Inputs that changed <span className="text-sm font-normal text-muted">({data.inputs.length.toLocaleString('en-US')})</span></h2>
        {data.inputs.length === 0 ? (
          <p className="px-3 pb-3 text-sm text-muted">The two cases have the same assumptions, engines, offers, trucks and plan settings.</p>
        ) : (
          <table className="data-table" data-testid="input-changes">
            <thead>
              <tr><th>Section</th><th>Item</th><th>Field</th><th>Unit</th><th className="n">{a}</th><th className="n">{b}</th><th className="n">Change</th></tr>
            </thead>
            <tbody>
              {inputs.map((c, i) => (
                <tr key={`${c.section}|${c.item}|${c.field}|${i}`}>
                  <td>{c.section}</td><td>{c.item ?? ''}</td><td>{c.label}</td><td>{c.unit}</td>
                  <td className="n tabular-nums">{inputValue(c.a)}</td><td className="n tabular-nums">{inputValue(c.b)}</td><td className="n tabular-nums">{inputChange(c)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <ShowAll total={data.inputs.length} open={allInputs} onOpen={() => setAllInputs(true)} />
      </section>
      <section className="card overflow-x-auto" aria-labelledby="result-changes">
        <h2 id="result-changes" className="p-3 text-base font-semibold">Results that changed <span className="text-sm font-normal text-muted">({data.results.length.toLocaleString('en-US')}; money in {data.currency})</span></h2>
        {data.results.length === 0 ? (
          <p className="px-3 pb-3 text-sm text-muted">Every NPV, best policy, ΔNPV and capital figure is the same to the cent.</p>
        ) : (
          <table className="data-table" data-testid="result-changes">
            <thead>
              <tr><th>Fleet or truck</th><th>Figure</th><th className="n">{a}</th><th className="n">{b}</th><th className="n">Change ({data.currency})</th></tr>
            </thead>
            <tbody>
              {results.map((r, i) => (
                <tr key={`${r.scope}|${r.measure}|${i}`}>
                  <td>{r.scope}</td><td>{r.measure}</td>
                  <td className="n tabular-nums">{money(r.a)}</td><td className="n tabular-nums">{money(r.b)}</td><td className="n tabular-nums">{resultChange(r)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <ShowAll total={data.results.length} open={allResults} onOpen={() => setAllResults(true)} />
      </section>
    </div>
  );
}

export function CaseCompare({ slug, initialA, initialB }: { slug: string; initialA: number | null; initialB: number | null }) {
  const router = useRouter();
  const pathname = usePathname();
  const [a, setA] = useState(initialA);
  const [b, setB] = useState(initialB);
  const { data: list, error: listError } = useSWR<{ cases: CaseSummaryDto[] }, ApiError>(`/api/workspaces/${slug}/cases`);
  const ready = a !== null && b !== null && a !== b;
  const url = `/api/workspaces/${slug}/cases/compare?a=${a}&b=${b}`;
  const { data, error, isLoading } = useSWR<CaseComparison, ApiError>(ready ? url : null);

  function choose(which: 'a' | 'b', id: number | null) {
    const next = { a, b, [which]: id };
    if (which === 'a') setA(id);
    else setB(id);
    const q = new URLSearchParams();
    if (next.a !== null) q.set('a', String(next.a));
    if (next.b !== null) q.set('b', String(next.b));
    router.replace(`${pathname}?${q}`, { scroll: false });
  }

  const cases = list?.cases ?? [];
  return (
    <div className="space-y-4">
      <div className="card flex flex-wrap items-end gap-4 p-3">
        <CasePicker label="Case A (from)" cases={cases} value={a} onChange={(id) => choose('a', id)} />
        <CasePicker label="Case B (to)" cases={cases} value={b} onChange={(id) => choose('b', id)} />
        {ready && data ? <a className="btn" href={`${url}&format=csv`} download>Download CSV</a> : null}
      </div>
      {listError ? <p role="alert" className="text-sm text-loss">Could not load the cases: {listError.message}</p> : null}
      {a !== null && a === b ? <p role="alert" className="text-sm text-loss">Case B: choose a different case from case A.</p> : null}
      {!ready && a !== b ? <p className="text-sm text-muted">Choose two cases. A draft is read from the current fleet data, a submitted case from its snapshot, an approved case from its frozen record.</p> : null}
      {ready && isLoading ? <div aria-busy="true" className="h-24 animate-pulse rounded bg-rule/60"><span className="sr-only">Comparing…</span></div> : null}
      {error ? (
        <div role="alert" className="card border-loss p-3 text-sm">
          <p className="font-medium text-loss">{error.message}</p>
          {error.problems.length ? <ul className="mt-1 list-disc pl-5">{error.problems.map((p) => <li key={p.path}>{p.path}: {p.message}</li>)}</ul> : null}
        </div>
      ) : null}
      {ready && data ? <Changes key={url} data={data} /> : null}
    </div>
  );
}
