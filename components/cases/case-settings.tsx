'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import useSWR, { useSWRConfig } from 'swr';
import type { CaseSummaryDto } from '@/lib/cases/types';
import { ApiError, sendJson } from '@/lib/fetcher';
import { createCaseSchema, type CreateCaseInput, type Selection } from '@/lib/validation/business-case';
import { TruckSelectionTable, type CaseOptions } from './truck-selection-table';

type CaseDto = { case: CaseSummaryDto; selection: Selection };
const EDITABLE = new Set(['draft', 'returned']);

/**
 * The case's own settings (name, assumption set, trucks, offer per truck),
 * edited in place. Only analysts and admins see it, and only while the case is
 * a draft or sent back; the server checks both again on save.
 */
export function CaseSettings({ slug, caseId, canEdit, startOpen = false }: { slug: string; caseId: number; canEdit: boolean; startOpen?: boolean }) {
  const key = `/api/workspaces/${slug}/cases/${caseId}`;
  const { data, mutate } = useSWR<CaseDto>(canEdit ? key : null);
  const [open, setOpen] = useState(startOpen);
  const options = useSWR<CaseOptions>(canEdit && open ? `/api/workspaces/${slug}/cases/options` : null);
  if (!canEdit || !data) return null;
  const c = data.case;
  if (!EDITABLE.has(c.status)) {
    return <p className="mb-3 text-sm text-muted" data-testid="case-settings-locked">This case is {c.status}; its settings can no longer be changed. Copy it to work on a changed version.</p>;
  }
  if (!open) {
    return (
      <div className="mb-3 flex items-center gap-3 text-sm">
        <span className="text-muted">{c.assumptionSetName ?? 'No assumption set'} assumptions · {c.truckCount} trucks</span>
        <button type="button" className="btn py-0.5" onClick={() => setOpen(true)}>Edit case settings</button>
      </div>
    );
  }
  if (options.error) return <p role="alert" className="mb-3 text-sm text-loss">Could not load the fleet: {options.error.message}</p>;
  if (!options.data) return <p className="mb-3 text-sm text-muted" aria-busy="true">Loading the fleet…</p>;
  return <SettingsForm key={c.version} slug={slug} data={data} options={options.data} onClose={() => setOpen(false)} reload={() => mutate()} />;
}

function SettingsForm({ slug, data, options, onClose, reload }: { slug: string; data: CaseDto; options: CaseOptions; onClose: () => void; reload: () => Promise<unknown> }) {
  const c = data.case;
  const caseKey = `/api/workspaces/${slug}/cases/${c.id}`;
  const known = new Set(options.trucks.map((t) => t.id));
  // Trucks deleted from the register since the case was saved cannot be kept.
  const gone = data.selection.filter((s) => !known.has(s.truckId)).length;
  const { mutate } = useSWRConfig();
  const router = useRouter();
  const [formError, setFormError] = useState<{ text: string; stale: boolean } | null>(null);
  const [rowErrors, setRowErrors] = useState<Record<number, string>>({});
  const form = useForm<CreateCaseInput>({
    resolver: zodResolver(createCaseSchema),
    defaultValues: { name: c.name, assumptionSetId: c.assumptionSetId ?? undefined, selection: data.selection.filter((s) => known.has(s.truckId)) },
  });
  const { register, handleSubmit, setValue, watch, setError, formState } = form;
  const selection = watch('selection');
  const errors = formState.errors;

  const submit = handleSubmit(async (values) => {
    setFormError(null);
    setRowErrors({});
    try {
      await sendJson(caseKey, 'PATCH', { version: c.version, ...values });
      // Everything under this case (result, plan, history) was computed from the old settings.
      await mutate((k) => typeof k === 'string' && k.startsWith(caseKey));
      router.refresh();
      onClose();
    } catch (e) {
      if (!(e instanceof ApiError)) return setFormError({ text: 'Could not reach the server; nothing was saved.', stale: false });
      if (e.status === 409) return setFormError({ text: `${e.message} Nothing was saved.`, stale: true });
      const rows: Record<number, string> = {};
      const other: string[] = [];
      for (const p of e.problems) {
        const m = /^selection\[(\d+)\]/.exec(p.path);
        const truck = m ? values.selection[Number(m[1])] : undefined;
        if (p.path === 'name' || p.path === 'assumptionSetId') setError(p.path, { message: p.message });
        else if (truck) rows[truck.truckId] = p.message;
        else other.push(`${p.path}: ${p.message}`);
      }
      setRowErrors(rows);
      setFormError({ text: [e.message, ...other].join(' '), stale: false });
    }
  });

  const selectionError = errors.selection?.message ?? errors.selection?.root?.message;

  return (
    <form onSubmit={submit} noValidate className="card mb-4 space-y-4 p-4" aria-label="Case settings" data-testid="case-settings">
      <h2 className="text-base font-semibold">Case settings</h2>
      <div className="grid gap-4 md:grid-cols-2">
        <div>
          <label className="label" htmlFor="settings-name">Case name</label>
          <input id="settings-name" className="field" {...register('name')} aria-invalid={errors.name ? true : undefined} aria-describedby="settings-name-error" />
          <p id="settings-name-error" className="mt-1 text-xs text-loss" aria-live="polite">{errors.name?.message}</p>
        </div>
        <div>
          <label className="label" htmlFor="settings-set">Assumption set</label>
          <select id="settings-set" className="field" {...register('assumptionSetId', { valueAsNumber: true })} aria-invalid={errors.assumptionSetId ? true : undefined} aria-describedby="settings-set-error">
            {c.assumptionSetId === null ? <option value="">(deleted — choose one)</option> : null}
            {options.assumptionSets.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </select>
          <p id="settings-set-error" className="mt-1 text-xs text-loss" aria-live="polite">{errors.assumptionSetId ? 'Choose an assumption set.' : null}</p>
        </div>
      </div>
      <fieldset>
        <legend className="label">Trucks ({selection.length} of {options.trucks.length}) and the repower offer for each</legend>
        {gone ? <p className="mb-2 text-xs text-caution">{gone} truck(s) of this case are no longer in the register; saving leaves them out.</p> : null}
        <TruckSelectionTable
          options={options}
          value={selection}
          rowErrors={rowErrors}
          onChange={(next) => setValue('selection', next, { shouldDirty: true, shouldValidate: formState.isSubmitted })}
        />
        <p className="mt-1 text-xs text-loss" aria-live="polite" data-testid="selection-error">{selectionError}</p>
      </fieldset>
      <div role="alert" aria-live="polite" className="text-sm text-loss" data-testid="settings-error">
        {formError?.text}
        {formError?.stale ? (
          <button type="button" className="btn ml-2 py-0.5" onClick={async () => { setFormError(null); await reload(); }}>Reload the case</button>
        ) : null}
      </div>
      <div className="flex items-center gap-2">
        <button type="submit" className="btn btn-primary" disabled={formState.isSubmitting}>{formState.isSubmitting ? 'Saving…' : 'Save settings'}</button>
        <button type="button" className="btn" onClick={onClose}>Cancel</button>
      </div>
    </form>
  );
}
