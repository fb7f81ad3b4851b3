'use client';

import { useState } from 'react';
import useSWR from 'swr';
import { readResponse, sendJson } from '@/lib/fetcher';
import { formatNumber } from '@/lib/format';
import { api, type WorkspaceView } from './types';

type Doc = { id: number; fileName: string; contentType: string; size: number; createdAt: string };

/** An offer's quote documents: members download; analysts and admins upload and remove. */
export function QuoteDocuments({ ws, offerId, offerKey }: { ws: WorkspaceView; offerId: number; offerKey: string }) {
  const key = api(ws.slug, `offers/${offerId}/documents`);
  const { data, mutate } = useSWR<{ items: Doc[] }>(key);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const upload = async (input: HTMLInputElement) => {
    const file = input.files?.[0];
    if (!file) return;
    setMessage(null);
    setBusy(true);
    const form = new FormData();
    form.set('file', file);
    try {
      await readResponse(await fetch(key, { method: 'POST', body: form }));
      await mutate();
      setMessage(`Uploaded ${file.name}.`);
    } catch (e) {
      const err = e as { message: string; problems?: Array<{ message: string }> };
      setMessage(`${err.problems?.map((p) => p.message).join(' ') || err.message} Nothing was saved.`);
    } finally {
      setBusy(false);
      input.value = '';
    }
  };
  const remove = async (d: Doc) => {
    if (!window.confirm(`Remove ${d.fileName}?`)) return;
    setMessage(null);
    try {
      await sendJson(`${key}/${d.id}`, 'DELETE');
      setMessage(`Removed ${d.fileName}.`);
    } catch (e) {
      setMessage(`${(e as Error).message} Nothing was removed.`);
    }
    await mutate();
  };

  return (
    <div className="mt-2" data-testid="quote-documents">
      <h3 className="text-sm font-semibold">Quote documents for {offerKey}</h3>
      {data?.items.length ? (
        <ul className="mt-1 text-sm">
          {data.items.map((d) => (
            <li key={d.id} className="flex items-center gap-3 py-0.5">
              <a className="text-accent hover:underline" href={`${key}/${d.id}`} download>{d.fileName}</a>
              <span className="text-xs text-muted">{d.size < 1024 ? `${d.size} bytes` : `${formatNumber(d.size / 1024, 0)} KB`} · {d.createdAt.slice(0, 10)}</span>
              {ws.canEdit ? <button type="button" className="text-xs text-loss hover:underline" onClick={() => remove(d)}>Remove</button> : null}
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-1 text-sm text-muted">{data ? 'No quote uploaded yet.' : 'Loading…'}</p>
      )}
      {ws.canEdit ? (
        <div className="mt-2">
          <label htmlFor={`quote-${offerId}`} className="label">Upload a quote (PDF, PNG, JPEG or WebP, up to 10 MB)</label>
          <input id={`quote-${offerId}`} type="file" accept=".pdf,.png,.jpg,.jpeg,.webp" disabled={busy} className="text-sm" onChange={(e) => upload(e.currentTarget)} />
        </div>
      ) : null}
      {message ? <p role="status" className="mt-1 text-sm" data-testid="quote-message">{message}</p> : null}
    </div>
  );
}
