'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useState, type ReactNode } from 'react';
import { useForm, type FieldErrors, type FieldValues, type Path, type Resolver } from 'react-hook-form';
import type { z } from 'zod';
import { fromDisplay, fromPercent, inputText, percentInputText, UNIT_LABEL, type Quantity, type UnitSystem } from '@/lib/display-units';
import { ApiError } from '@/lib/fetcher';
import { formatNumberText, numberExample, parseNumberText, type NumberFormat } from '@/lib/number-input';

export type FieldSpec = {
  name: string;
  label: string;
  kind: 'number' | 'text' | 'textarea' | 'select';
  /** For selects: option values; numeric ids are sent as numbers. */
  options?: Array<{ value: string | number; label: string }>;
  numericOptions?: boolean;
  /** An empty number or select means null (not "missing"). */
  nullable?: boolean;
  hint?: ReactNode;
  wide?: boolean;
  /**
   * A number stored in metric units that the workspace may read in US
   * customary: the label gets the unit, the field shows and takes the value
   * in the workspace's units, and it is stored in metric.
   */
  quantity?: Quantity;
  /** A fraction (0–1) stored, shown and typed as a percentage (0–100); the label gets "(%)". */
  percent?: boolean;
};

function errorAt(errors: FieldErrors, path: string): string | undefined {
  let v: unknown = errors;
  for (const key of path.split('.')) v = v && typeof v === 'object' ? (v as Record<string, unknown>)[key] : undefined;
  const msg = (v as { message?: unknown } | undefined)?.message;
  return typeof msg === 'string' ? msg : undefined;
}

/** The form's first values: converted fields (dotted names reach into nested objects) as they are shown. */
function withShown(values: FieldValues, shown: Record<string, number | null>): FieldValues {
  const out = structuredClone(values);
  for (const [name, v] of Object.entries(shown)) {
    const path = name.split('.');
    const last = path.pop() as string;
    const parent = path.reduce<FieldValues | undefined>((o, key) => (o && typeof o === 'object' ? (o[key] as FieldValues) : undefined), out);
    if (parent && typeof parent === 'object' && (v !== null || last in parent)) parent[last] = v ?? parent[last];
  }
  return out;
}

/** Field errors of both checks, nested by path; `over` wins where both name a field. */
function mergeErrors(base: Record<string, unknown>, over: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...base };
  for (const [key, v] of Object.entries(over)) {
    const b = out[key] as Record<string, unknown> | undefined;
    const leaf = (x: unknown) => !!x && typeof x === 'object' && 'message' in (x as object);
    out[key] = b && typeof b === 'object' && !leaf(b) && !leaf(v) ? mergeErrors(b, v as Record<string, unknown>) : v;
  }
  return out;
}

/** Number fields' first values as text in the workspace's format (0.55 → "0,55" where decimals take a comma). */
function asTyped(values: FieldValues, names: string[], format: NumberFormat): FieldValues {
  const out = structuredClone(values);
  for (const name of names) {
    const path = name.split('.');
    const last = path.pop() as string;
    const parent = path.reduce<FieldValues | undefined>((o, key) => (o && typeof o === 'object' ? (o[key] as FieldValues) : undefined), out);
    if (parent && typeof parent[last] === 'number') parent[last] = formatNumberText(parent[last] as number, format);
  }
  return out;
}

/**
 * One form for every register entity: react-hook-form validated by the same
 * zod schema the API uses, errors shown per field; problems the server finds
 * (a duplicate key, a stale version) land on the field or above the buttons.
 */
export function EntityForm<S extends z.ZodType<FieldValues, FieldValues>>(props: {
  schema: S;
  fields: FieldSpec[];
  defaultValues: Partial<z.input<S>>;
  submitLabel: string;
  onSubmit: (values: z.output<S>) => Promise<void>;
  onCancel?: () => void;
  extraActions?: ReactNode;
  /** a notice drawn above the buttons from the values as typed (e.g. a warning that does not block saving) */
  notice?: (values: FieldValues) => ReactNode;
  testId?: string;
  /** the workspace's display units (default metric) */
  units?: UnitSystem;
  /** how the workspace types numbers (default "point": 18,950.5) */
  numberFormat?: NumberFormat;
}) {
  const units = props.units ?? 'metric';
  const numberFormat = props.numberFormat ?? 'point';
  const quantities = props.fields.filter((f) => (f.quantity || f.percent) && f.kind === 'number');
  const stored = props.defaultValues as FieldValues;
  const storedAt = (name: string): unknown => name.split('.').reduce<unknown>((v, key) => (v && typeof v === 'object' ? (v as FieldValues)[key] : undefined), stored);
  const shownText = (f: FieldSpec, value: number | null | undefined) =>
    f.percent ? percentInputText(value) : inputText(f.quantity as Quantity, value, units);
  const fromShown = (f: FieldSpec, shown: number) => (f.percent ? fromPercent(shown) : fromDisplay(f.quantity as Quantity, shown, units));
  // what each converted field (unit-bearing or percentage) shows at first, as a number in its shown unit
  const shownAtFirst: Record<string, number | null> = {};
  for (const f of quantities) {
    const text = shownText(f, storedAt(f.name) as number | null | undefined);
    shownAtFirst[f.name] = text === '' ? null : Number(text);
  }
  /** Converted fields back to stored units; a field left as it was shown keeps its stored number exactly. */
  const toStored = (values: FieldValues): FieldValues => {
    const out = structuredClone(values);
    for (const f of quantities) {
      const path = f.name.split('.');
      const last = path.pop() as string;
      const parent = path.reduce<FieldValues | undefined>((v, key) => (v && typeof v === 'object' ? (v[key] as FieldValues) : undefined), out);
      const shown = parent?.[last];
      if (!parent || typeof shown !== 'number') continue;
      parent[last] = shown === shownAtFirst[f.name] ? storedAt(f.name) : fromShown(f, shown);
    }
    return out;
  };
  // zod 4 schemas are typed loosely here; the schema itself is the contract.
  const check = zodResolver(props.schema as never) as unknown as Resolver<FieldValues>;
  const numberFields = props.fields.filter((f) => f.kind === 'number');
  const plainLabel = (f: FieldSpec) => f.label.replace(/\s*\([^)]*\)\s*$/, '');
  /**
   * Number fields hold the text typed; it is read by the one rule of forms and
   * imports (lib/number-input.ts) in the workspace's format, each problem a
   * plain message naming the field ("Engine hours: enter a number such as 18,950").
   */
  const readNumbers = (values: FieldValues): { values: FieldValues; errors: Record<string, unknown> } => {
    const out = structuredClone(values);
    const errors: Record<string, unknown> = {};
    for (const f of numberFields) {
      const path = f.name.split('.');
      const last = path.pop() as string;
      const parent = path.reduce<FieldValues | undefined>((v, key) => (v && typeof v === 'object' ? (v[key] as FieldValues) : undefined), out);
      if (!parent) continue;
      const raw = parent[last];
      // the field's first value is the example a message gives ("Load factor: enter a number such as 0.48")
      const first = shownAtFirst[f.name] ?? storedAt(f.name);
      const example = typeof first === 'number' ? formatNumberText(first, numberFormat, true) : numberExample(numberFormat);
      const r = typeof raw === 'number' ? { ok: true as const, value: raw } : parseNumberText(raw == null ? '' : String(raw), numberFormat, { example });
      let message: string | null = null;
      if (!r.ok) message = r.message;
      else if (r.value === null && !f.nullable) message = `enter a number such as ${example}`;
      if (message) {
        const at = path.reduce<Record<string, unknown>>((o, key) => (o[key] ??= {}) as Record<string, unknown>, errors);
        at[last] = { type: 'number', message: `${plainLabel(f)}: ${message}` };
      } else parent[last] = r.ok ? r.value : null;
    }
    return { values: out, errors };
  };
  const { register, handleSubmit, setError, formState, watch } = useForm<FieldValues>({
    // The schema's ranges are in stored (metric) units, so unit-bearing fields are
    // converted before the check; submit receives the schema's output, already stored.
    resolver: async (values, context, options) => {
      const read = readNumbers(values);
      const checked = await check(toStored(read.values), context, options);
      if (Object.keys(read.errors).length === 0) return checked;
      // a number that cannot be read wins over what the schema says about the same field
      return { values: {}, errors: mergeErrors(checked.errors as Record<string, unknown>, read.errors) as never };
    },
    // Only the form's own fields: the schemas are strict, so a row's id or version must not ride along.
    defaultValues: asTyped(
      withShown(
        Object.fromEntries(Object.entries(stored).filter(([k]) => props.fields.some((f) => f.name.split('.')[0] === k))),
        shownAtFirst,
      ),
      numberFields.map((f) => f.name),
      numberFormat,
    ),
  });

  const [formError, setFormError] = useState<string | null>(null);
  const names = new Set(props.fields.map((f) => f.name));

  const submit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await props.onSubmit(values as z.output<S>);
    } catch (e) {
      if (!(e instanceof ApiError)) throw e;
      const elsewhere: string[] = [];
      for (const p of e.problems) {
        if (names.has(p.path)) setError(p.path as Path<FieldValues>, { message: p.message });
        else elsewhere.push(`${p.path}: ${p.message}`);
      }
      setFormError([e.message, ...elsewhere].join(' '));
    }
  });

  return (
    <form onSubmit={submit} noValidate className="card p-4" data-testid={props.testId}>
      <div className="grid grid-cols-2 gap-x-4 gap-y-3 md:grid-cols-3 xl:grid-cols-4">
        {props.fields.map((f) => {
          const err = errorAt(formState.errors, f.name);
          const id = `f-${f.name.replace(/\./g, '-')}`;
          const common = { id, 'aria-invalid': err ? true : undefined, 'aria-describedby': err ? `${id}-err` : undefined, className: 'field' };
          const asNumber = (v: unknown) => (v === '' || v === null || v === undefined ? (f.nullable ? null : undefined) : Number(v));
          const describedBy = [f.hint ? `${id}-hint` : null, err ? `${id}-err` : null].filter(Boolean).join(' ') || undefined;
          return (
            <div key={f.name} className={f.wide ? 'col-span-2' : undefined}>
              <label htmlFor={id} className="label">{f.quantity ? `${f.label} (${UNIT_LABEL[units][f.quantity]})` : f.percent ? `${f.label} (%)` : f.label}</label>
              {f.kind === 'select' ? (
                <select {...common} {...register(f.name, f.numericOptions ? { setValueAs: asNumber } : {})}>
                  {f.nullable ? <option value="">(none)</option> : null}
                  {f.options?.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
                </select>
              ) : f.kind === 'textarea' ? (
                <textarea rows={2} {...common} {...register(f.name)} />
              ) : f.kind === 'number' ? (
                <input type="text" inputMode="decimal" {...common} aria-describedby={describedBy} className="field text-right" {...register(f.name)} />
              ) : (
                <input type="text" {...common} {...register(f.name)} />
              )}
              {f.hint ? <p id={`${id}-hint`} className="mt-0.5 text-xs text-muted">{f.hint}</p> : null}
              <p id={`${id}-err`} aria-live="polite" className="mt-0.5 text-xs text-loss">{err}</p>
            </div>
          );
        })}
      </div>
      {props.notice ? props.notice(watch()) : null}
      <div role="alert" aria-live="polite" className="mt-3 text-sm text-loss" data-testid="form-error">{formError}</div>
      <div className="mt-3 flex items-center gap-2">
        <button type="submit" className="btn btn-primary" disabled={formState.isSubmitting}>{formState.isSubmitting ? 'Saving…' : props.submitLabel}</button>
        {props.onCancel ? <button type="button" className="btn" onClick={props.onCancel}>Cancel</button> : null}
        <div className="ml-auto flex gap-2">{props.extraActions}</div>
      </div>
    </form>
  );
}
