'use client';

import { useEffect, useMemo, useState } from 'react';
import useSWR from 'swr';
import { ApiError, sendJson } from '@/lib/fetcher';
import { createCaseSchema } from '@/lib/validation/business-case';

type Options = {
  assumptionSets: Array<{ id: number; name: string }>;
  trucks: Array<{ id: number; unitNumber: string; payloadClass: string; repowerOfferId: number | null }>;
  offers: Array<{ id: number; key: string; supplier: string }>;
};
type Problem = { path: string; message: string };

/** New case: name, assumption set, trucks (all by default) and the offer for each (the truck's own by default). */
export function CreateCaseForm({ slug, onCreated, onCancel }: { slug: string; onCreated: (id: number) => void; onCancel: () => void }) {
  const { data, error, isLoading } = useSWR<Options>(`/api/workspaces/${slug}/cases/options`);
  const [name, setName] = useState('');
  const [setId, setSetId] = useState<number | ''>('');
  const [chosen, setChosen] = useState<Set<number>>(new Set());
  const [offerFor, setOfferFor] = useState<Record<number, number | null>>({});
  const [problems, setProblems] = useState<Problem[]>([]);
  const [message, setMessage] = useState('');
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    if (!data) return;
    setChosen(new Set(data.trucks.map((t) => t.id)));
    const base = data.assumptionSets.find((s) => /base/i.test(s.name)) ?? data.assumptionSets[0];
    if (base) setSetId(base.id);
  }, [data]);

  const offerKey = useMemo(() => new Map((data?.offers ?? []).map((o) => [o.id, o.key])), [data]);
  const problemAt = (path: string) => problems.filter((p) => p.path === path || p.path.startsWith(`${path}[`) || p.path.startsWith(`${path}.`));

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    if (!data) return;
    const body = {
      name,
      assumptionSetId: setId === '' ? 0 : setId,
      selection: data.trucks.filter((t) => chosen.has(t.id)).map((t) => ({ truckId: t.id, repowerOfferId: offerFor[t.id] ?? null })),
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

  const all = chosen.size === data.trucks.length;
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
        <legend className="label">Trucks ({chosen.size} of {data.trucks.length}) and the repower offer for each</legend>
        <label className="mb-2 inline-flex items-center gap-2 text-sm">
          <input type="checkbox" checked={all} onChange={() => setChosen(all ? new Set() : new Set(data.trucks.map((t) => t.id)))} /> All trucks
        </label>
        <div className="max-h-72 overflow-y-auto rounded border border-rule">
          <table className="data-table">
            <thead><tr><th>Include</th><th>Truck</th><th>Class</th><th>Repower offer</th></tr></thead>
            <tbody>
              {data.trucks.map((t) => (
                <tr key={t.id}>
                  <td>
                    <input type="checkbox" aria-label={`Include ${t.unitNumber}`} checked={chosen.has(t.id)} onChange={() => { const n = new Set(chosen); if (n.has(t.id)) n.delete(t.id); else n.add(t.id); setChosen(n); }} />
                  </td>
                  <td className="font-mono text-xs">{t.unitNumber}</td>
                  <td>{t.payloadClass}</td>
                  <td>
                    <select aria-label={`Offer for ${t.unitNumber}`} className="field py-0.5" value={offerFor[t.id] ?? ''} onChange={(e) => setOfferFor({ ...offerFor, [t.id]: e.target.value === '' ? null : Number(e.target.value) })}>
                      <option value="">Truck&rsquo;s own{t.repowerOfferId ? ` (${offerKey.get(t.repowerOfferId)})` : ' (none)'}</option>
                      {data.offers.map((o) => <option key={o.id} value={o.id}>{o.key} — {o.supplier}</option>)}
                    </select>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
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
