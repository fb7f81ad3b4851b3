import { NextResponse } from 'next/server';
import { z } from 'zod';
import { EventLimitError } from '@/lib/engine/limits';
import { CaseValidationError } from '@/lib/validation/case';

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

/** Read a JSON body or throw a 422 that says the body is not JSON. */
export async function readJson(request: Request): Promise<unknown> {
  try {
    return await request.json();
  } catch {
    throw invalid([{ path: '(body)', message: 'The request body is not valid JSON.' }]);
  }
}

export function errorResponse(err: unknown): NextResponse {
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

/**
 * Wraps a route handler: any HttpError or ZodError becomes its JSON answer,
 * anything else a generic 500 with the cause logged on the server.
 */
export function route<P = Record<string, string>>(handler: (request: Request, ctx: Ctx<P>) => Promise<Response>) {
  return async (request: Request, ctx: Ctx<P>): Promise<Response> => {
    try {
      return await handler(request, ctx);
    } catch (err) {
      return errorResponse(err);
    }
  };
}
