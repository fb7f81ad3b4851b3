import { z } from '@/lib/validation/zod';
import { ID_PATTERN } from './id';

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2027-03-31.');
const blankToUndefined = (v: unknown) => (v === '' || v === null ? undefined : v);

/** Query string of the audit log page, API and CSV download. */
export const auditFilterSchema = z
  .object({
    // a user id by the rule of every id in a URL (lib/validation/id.ts): "1e3" or an 11-digit id is not one
    user: z.preprocess(blankToUndefined, z.string().regex(ID_PATTERN, { message: 'Choose a person from the list.', abort: true }).transform(Number).optional()),
    kind: z.preprocess(blankToUndefined, z.string().regex(/^[a-z_-]+(:[a-z_-]+)?$/, 'Choose a kind from the list.').optional()),
    from: z.preprocess(blankToUndefined, day.optional()),
    to: z.preprocess(blankToUndefined, day.optional()),
    page: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).max(100000).default(1)),
  })
  .refine((f) => !f.from || !f.to || f.from <= f.to, { path: ['to'], message: 'The end date is before the start date.' });

export type AuditFilter = z.infer<typeof auditFilterSchema>;

export const searchParamsObject = (sp: URLSearchParams | Record<string, string | string[] | undefined>) =>
  sp instanceof URLSearchParams ? Object.fromEntries(sp.entries()) : Object.fromEntries(Object.entries(sp).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
