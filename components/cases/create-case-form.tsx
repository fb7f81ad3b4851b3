'use client';

import { useEffect, useState } from 'react';
import useSWR from 'swr';
import { ApiError, sendJson } from '@/lib/fetcher';
import { createCaseSchema, type Selection } from '@/lib/validation/business-case';
import { TruckSelectionTable, type CaseOptions } from './truck-selection-table';

type Problem = { path: string; message: string };

/** New case: name, assumption set, trucks (all by default) and the offer for each (the truck's own by default). */
export function CreateCaseForm({ slug, onCreated, onCancel }: { slug: string; onCreated: (id: number) => void; onCancel: () => void }) {
  const { data, error, isLoading } = useSWR<CaseOptions>(`/api/workspaces/${slug}/cases/options`);
  const [name, setName] = useState('');
  const [setId, setSetId] = useState<number | ''>('');
  const [selection, setSelection] = useState<Selection>([]);
  const [problems, setProblems] = useState<Problem[]>([]);
  const [message, setMessage] = useState('');
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    if (!data) return;
    setSelection(data.trucks.map((t) => ({ truckId: t.id, repowerOfferId: null })));
    const base = data.assumptionSets.find((s) => /base/i.test(s.name)) ?? data.assumptionSets[0];
    if (base) setSetId(base.id);
  }, [data]);

  const problemAt = (path: string) => problems.filter((p) => p.path === path || p.path.startsWith(`${path}[`) || p.path.startsWith(`${path}.`));

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    if (!data) return;
    const body = {
      name,
      assumptionSetId: setId === '' ? 0 : setId,
      selection,
    };
    const local = createCaseSchema.safeParse(body);
    if (!local.success) {
      setProblems(local.error.issues.map((i) => ({ path: i.path.join('.') || '(root)', message: i.message })));
      setMessage('Some values need attention.');
      return;
    }
    setBusy(true);
    setProblems([]);
    setMessage('');
    try {
      const r = await sendJson<{ case: { id: number } }>(`/api/workspaces/${slug}/cases`, 'POST', local.data);
      onCreated(r.case.id);
    } catch (err) {
      if (err instanceof ApiError) {
        setProblems(err.problems);
        setMessage(err.message);
      } else setMessage('Could not reach the server.');
    } finally {
      setBusy(false);
    }
  }

  if (error) return <p role="alert" className="text-sm text-loss">Could not load the fleet: {error.message}</p>;
  if (isLoading || !data) return <p className="text-sm text-muted" aria-busy="true">Loading the fleet…</p>;

  return (
    <form onSubmit={submit} className="card space-y-4 p-4" aria-label="New business case" noValidate>
      <div className="grid gap-4 md:grid-cols-2">
        <div>
          <label className="label" htmlFor="case-name">Name</label>
          <input id="case-name" className="field" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={problemAt('name').length > 0} aria-describedby="case-name-error" />
          <p id="case-name-error" className="mt-1 text-xs text-loss" aria-live="polite">{problemAt('name').map((p) => p.message).join('; ')}</p>
        </div>
        <div>
          <label className="label" htmlFor="case-set">Assumption set</label>
          <select id="case-set" className="field" value={setId} onChange={(e) => setSetId(e.target.value === '' ? '' : Number(e.target.value))} aria-invalid={problemAt('assumptionSetId').length > 0}>
            {data.assumptionSets.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </select>
          <p className="mt-1 text-xs text-loss" aria-live="polite">{problemAt('assumptionSetId').map((p) => p.message).join('; ')}</p>
        </div>
      </div>
      <fieldset>
        <legend className="label">Trucks ({selection.length} of {data.trucks.length}) and the repower offer for each</legend>
        <TruckSelectionTable options={data} value={selection} onChange={setSelection} />
        <p className="mt-1 text-xs text-loss" aria-live="polite">{problemAt('selection').map((p) => `${p.path}: ${p.message}`).join('; ')}</p>
      </fieldset>
      <div className="flex items-center gap-2">
        <button type="submit" className="btn btn-primary" disabled={busy}>{busy ? 'Creating…' : 'Create case'}</button>
        <button type="button" className="btn" onClick={onCancel}>Cancel</button>
        <p role="status" className="text-sm text-loss">{message}</p>
      </div>
    </form>
  );
}
