'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import useSWR, { useSWRConfig } from 'swr';
import type { EngineRow } from '@/components/fleet/types';
import type { CaseSummaryDto } from '@/lib/cases/types';
import { ApiError, sendJson } from '@/lib/fetcher';
import { formatNumber } from '@/lib/format';

const EDITABLE = new Set(['draft', 'returned']);

/**
 * Which engine types' planned overhaul life this case overrides (adopted from
 * the engine library's recommendation, issue 15), against the library's own;
 * editors may drop an override while the case is open to edits. Shows nothing
 * when the case overrides none.
 */
export function CaseEngineLives({ slug, caseId, canEdit }: { slug: string; caseId: number; canEdit: boolean }) {
  const key = `/api/workspaces/${slug}/cases/${caseId}`;
  const { data } = useSWR<{ case: CaseSummaryDto }>(key);
  const engines = useSWR<{ items: EngineRow[] }>(data && Object.keys(data.case.engineLives).length ? `/api/workspaces/${slug}/engines` : null);
  const { mutate } = useSWRConfig();
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  if (!data) return null;
  const c = data.case;
  const lives = Object.entries(c.engineLives);
  if (!lives.length) return null;
  const byId = new Map((engines.data?.items ?? []).map((e) => [String(e.id), e]));
  const editable = canEdit && EDITABLE.has(c.status);
  const remove = async (engineId: string) => {
    setError(null);
    const next = Object.fromEntries(lives.filter(([id]) => id !== engineId));
    try {
      await sendJson(key, 'PATCH', { version: c.version, engineLives: next });
      await mutate((k) => typeof k === 'string' && k.startsWith(key));
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiError ? e.message : 'Could not reach the server; nothing was saved.');
    }
  };
  return (
    <section className="card mb-3 p-3 text-sm" aria-labelledby="engine-lives-title" data-testid="case-engine-lives">
      <h2 id="engine-lives-title" className="mb-1 font-semibold">Engine lives this case overrides</h2>
      <p className="mb-2 text-xs text-muted">
        The case plans these engine types&apos; overhauls at its own life instead of the engine library&apos;s; every figure of the case, its export and its
        snapshots use it. <Link className="text-accent underline" href={`/${slug}/engines`}>Engine library</Link>
      </p>
      <ul className="space-y-1">
        {lives.map(([id, hours]) => {
          const e = byId.get(id);
          return (
            <li key={id} className="flex flex-wrap items-center gap-2" data-testid="engine-life-override">
              <span>
                <span className="font-mono text-xs">{e?.key ?? `engine type #${id}`}</span>: planned life <strong className="tabular-nums">{formatNumber(hours)} h</strong>
                {e ? <span className="text-muted"> (library {formatNumber(e.lifeHours)} h)</span> : null}
              </span>
              {editable ? (
                <button type="button" className="btn py-0 text-xs" aria-label={`Use the library's life for ${e?.key ?? id}`} onClick={() => remove(id)}>
                  Use the library&apos;s life
                </button>
              ) : null}
            </li>
          );
        })}
      </ul>
      {error ? <p role="alert" className="mt-1 text-loss">{error}</p> : null}
    </section>
  );
}
