import { notFound } from 'next/navigation';
import type { z } from 'zod';

/**
 * A page's dynamic segments read with a schema (`idParams` from lib/http.ts,
 * `unitPageParam` from lib/cases/params.ts): anything that does not match shows
 * Next's not-found page, as a route handler answers 404 through `readParams`.
 */
export function readPageParams<T extends z.ZodType>(schema: T, params: unknown): z.output<T> {
  const r = schema.safeParse(params);
  if (!r.success) notFound();
  return r.data;
}
