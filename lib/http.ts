import { NextResponse } from 'next/server';
import { z } from '@/lib/validation/zod';
import { EventLimitError } from '@/lib/engine/limits';
import { CaseValidationError } from '@/lib/validation/case';
import { ID_PATTERN } from '@/lib/validation/id';
import { BODY_LIMITS, BodyTooLargeError, limitBody, type BodyLimit } from '@/lib/http/body';
import { appOrigins, checkContentType, checkSameOrigin, HSTS, isHttps, RequestRefused, SAFE_METHODS, type BodyKind } from '@/lib/http/origin';
import { withRequestOrigin } from '@/lib/mail/base-url';

export { BODY_LIMITS, type BodyLimit } from '@/lib/http/body';

export type Problem = { path: string; message: string };

/** An error with an HTTP status that route handlers turn into a JSON answer. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly problems?: Problem[],
  ) {
    super(message);
  }
}

export const unauthorized = () => new HttpError(401, 'Sign in to continue.');
export const forbidden = (why = 'Your role in this workspace does not allow this.') => new HttpError(403, why);
export const notFound = (what = 'Not found.') => new HttpError(404, what);
export const conflict = (why = 'Someone else changed this since you loaded it. Reload and try again.') => new HttpError(409, why);
export const invalid = (problems: Problem[], message = 'Some values are not valid.') => new HttpError(422, message, problems);

/** `a.b[2].c` from a zod issue path. */
export function formatPath(path: ReadonlyArray<PropertyKey>): string {
  return path.reduce<string>((acc, key) => (typeof key === 'number' ? `${acc}[${key}]` : acc ? `${acc}.${String(key)}` : String(key)), '');
}

export function zodProblems(error: z.ZodError): Problem[] {
  return error.issues.map((i) => ({ path: formatPath(i.path) || '(root)', message: i.message }));
}

/** Parse with a zod schema or throw a 422 listing every problem. */
export function parseOr422<T extends z.ZodType>(schema: T, data: unknown): z.infer<T> {
  const r = schema.safeParse(data);
  if (!r.success) throw invalid(zodProblems(r.error));
  return r.data;
}

/**
 * A numeric id from the URL (`[id]`, `[docId]`, `[userId]`, …): the text of a
 * whole number from 1 to 999,999,999 (lib/validation/id.ts), as a number.
 * "0x10", "1e1", "01", " 7" and an 11-digit id are not ids.
 */
export const idParam = z.string().regex(ID_PATTERN, 'must be an id (a whole number from 1 to 999,999,999)').transform(Number);

/** The params of a route or page with one `[id]` segment; `.extend({ docId: idParam })` for more. */
export const idParams = z.object({ id: idParam });

/**
 * A route handler's dynamic segments read with a schema (`idParams` and the
 * like): anything that does not match cannot name a row, so it is a 404
 * `{ error: 'Not found.' }`, on every route alike. Pages use `readPageParams`
 * (lib/http/page-params.ts), which shows the not-found page instead.
 */
export function readParams<T extends z.ZodType>(schema: T, params: unknown): z.output<T> {
  const r = schema.safeParse(params);
  if (!r.success) throw notFound();
  return r.data;
}

/**
 * An id from the query string (`?assumptionSetId=N`) by the same rule as
 * `idParam`: null when absent or blank; a malformed one is the caller's input,
 * so 422 naming the parameter (never a lookup with a value no column holds).
 */
export function readQueryId(query: URLSearchParams, key: string, message = 'must be an id (a whole number from 1 to 999,999,999)'): number | null {
  const raw = query.get(key);
  if (raw === null || raw === '') return null;
  const r = idParam.safeParse(raw);
  if (!r.success) throw invalid([{ path: key, message }]);
  return r.data;
}

/** Read a JSON body or throw a 422 that says the body is not JSON (a body over its limit stays a 413). */
export async function readJson(request: Request): Promise<unknown> {
  try {
    return await request.json();
  } catch (err) {
    if (err instanceof BodyTooLargeError) throw err;
    throw invalid([{ path: '(body)', message: 'The request body is not valid JSON.' }]);
  }
}

/** Read a multipart body or throw a 422 with `message` (a body over its limit stays a 413). */
export async function readForm(request: Request, message: string): Promise<FormData> {
  try {
    return await request.formData();
  } catch (err) {
    if (err instanceof BodyTooLargeError) throw err;
    throw invalid([{ path: '(body)', message }]);
  }
}

export function errorResponse(err: unknown): NextResponse {
  if (err instanceof BodyTooLargeError) {
    return NextResponse.json({ error: err.message, limitBytes: err.limit.bytes }, { status: 413, headers: { connection: 'close' } });
  }
  if (err instanceof RequestRefused) return NextResponse.json({ error: err.message }, { status: err.status });
  if (err instanceof HttpError) {
    return NextResponse.json({ error: err.message, ...(err.problems ? { problems: err.problems } : {}) }, { status: err.status });
  }
  // the engine refusing a case (a run that would not end, or a case that does not validate) is the caller's input
  if (err instanceof EventLimitError) {
    return NextResponse.json({ error: 'This case cannot be evaluated.', problems: [{ path: `truck ${err.truckId}`, message: err.message }] }, { status: 422 });
  }
  if (err instanceof CaseValidationError) {
    return NextResponse.json({ error: 'This case cannot be evaluated.', problems: err.problems }, { status: 422 });
  }
  if (err instanceof z.ZodError) {
    return NextResponse.json({ error: 'Some values are not valid.', problems: zodProblems(err) }, { status: 422 });
  }
  console.error('[haulcase] unhandled error in route handler:', err);
  return NextResponse.json({ error: 'Something went wrong on our side. The error has been logged.' }, { status: 500 });
}

type Ctx<P> = { params: Promise<P> };

export type RouteOptions = {
  /** What a state-changing request must send (Content-Type): JSON unless the route takes an upload. */
  body?: BodyKind;
  /** The most bytes the body may have (BODY_LIMITS.json unless said). */
  limit?: BodyLimit;
};

/** Headers on every API answer: never cached; HSTS when served over https. */
export function withApiHeaders(response: Response, request: Request): Response {
  let res = response;
  const set = (name: string, value: string) => {
    try {
      res.headers.set(name, value);
    } catch {
      // immutable headers (Response.redirect): copy the answer once
      res = new Response(res.body, res);
      res.headers.set(name, value);
    }
  };
  if (!res.headers.has('cache-control')) set('cache-control', 'no-store');
  if (isHttps(request)) set('strict-transport-security', HSTS);
  return res;
}

/**
 * Wraps a route handler:
 *  - a state-changing request (not GET, HEAD, OPTIONS) must come from the app's
 *    own origin (403) with the route's content type (415): `lib/http/origin.ts`;
 *  - the body is refused on Content-Length over the route's limit (413) and read
 *    through a stream that stops at the limit: `lib/http/body.ts`;
 *  - any HttpError or ZodError becomes its JSON answer, anything else a generic
 *    500 with the cause logged on the server;
 *  - every answer is `Cache-Control: no-store` (HSTS over https).
 */
export function route<P = Record<string, string>>(handler: (request: Request, ctx: Ctx<P>) => Promise<Response>, options: RouteOptions = {}) {
  const limit = options.limit ?? BODY_LIMITS.json;
  const kind = options.body ?? 'json';
  return async (request: Request, ctx: Ctx<P>): Promise<Response> => {
    let response: Response;
    try {
      if (!SAFE_METHODS.has(request.method.toUpperCase())) {
        checkSameOrigin(request);
        checkContentType(request, kind);
      }
      // mail built while answering links back to the origin the request used when no APP_URL is set
      const origin = appOrigins(request)[0];
      response = await withRequestOrigin(origin, () => handler(limitBody(request, limit), ctx));
    } catch (err) {
      response = errorResponse(err);
    }
    return withApiHeaders(response, request);
  };
}
