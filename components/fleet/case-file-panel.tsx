'use client';

import { useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import { ApiError, sendJson } from '@/lib/fetcher';
import { api, type AssumptionSetRow, type WorkspaceView } from './types';

type Counts = { created: string[]; updated: string[] };
type Result = { name: string; engines: Counts; repowerOffers: Counts; trucks: Counts; assumptionSets: Counts };

/** Download the workspace as a case/1 file with one assumption set, or bring one in (all or nothing). */
export function CaseFilePanel({ ws }: { ws: WorkspaceView }) {
  const { mutate } = useSWRConfig();
  const sets = useSWR<{ items: AssumptionSetRow[] }>(api(ws.slug, 'assumption-sets'));
  const [setId, setSetId] = useState<string>('');
  const [message, setMessage] = useState<string | null>(null);
  const [problems, setProblems] = useState<Array<{ path: string; message: string }>>([]);
  const chosen = setId || String(sets.data?.items[0]?.id ?? '');

  const upload = async (file: File | undefined) => {
    setMessage(null);
    setProblems([]);
    if (!file) return;
    let body: unknown;
    try {
      body = JSON.parse(await file.text());
    } catch {
      setMessage(`"${file.name}" is not a JSON case file. Nothing was saved.`);
      return;
    }
    try {
      const r = await sendJson<Result>(api(ws.slug, 'case-file'), 'POST', body);
      const n = (c: Counts) => `${c.created.length} added, ${c.updated.length} updated`;
      setMessage(`Imported "${r.name}": trucks ${n(r.trucks)}; engine types ${n(r.engines)}; offers ${n(r.repowerOffers)}; assumption set ${r.assumptionSets.created.length ? 'added' : 'updated'}.`);
      await mutate((key) => typeof key === 'string' && key.startsWith(api(ws.slug, '')));
    } catch (e) {
      if (!(e instanceof ApiError)) throw e;
      setMessage(e.message);
      setProblems(e.problems);
    }
  };

  return (
    <section className="card mt-6 p-4" aria-labelledby="case-file-h">
      <h2 id="case-file-h" className="text-base font-semibold">Case file (case/1)</h2>
      <p className="mt-1 text-sm text-muted">The register, engine library, offers and one assumption set as one JSON file, for the command line or another workspace.</p>
      <div className="mt-2 flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor="case-set" className="label">Assumption set</label>
          <select id="case-set" className="field" value={chosen} onChange={(e) => setSetId(e.target.value)}>
            {sets.data?.items.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </select>
        </div>
        <a className="btn" href={chosen ? `${api(ws.slug, 'case-file')}?assumptionSetId=${chosen}` : undefined} download>Download case file</a>
        {ws.canEdit ? (
          <div>
            <label htmlFor="case-upload" className="label">Upload a case file (.json)</label>
            <input id="case-upload" type="file" accept=".json,application/json" className="text-sm" onChange={(e) => upload(e.target.files?.[0])} />
          </div>
        ) : null}
      </div>
      {message ? <p role="status" className="mt-2 text-sm" data-testid="case-file-message">{message}</p> : null}
      {problems.length ? (
        <ul className="mt-1 list-disc pl-5 text-sm text-loss">{problems.slice(0, 50).map((p, i) => <li key={i}><span className="font-mono text-xs">{p.path}</span>: {p.message}</li>)}</ul>
      ) : null}
    </section>
  );
}
