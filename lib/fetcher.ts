/** An error from the API, with its status and any listed problems. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly problems: Array<{ path: string; message: string }> = [],
  ) {
    super(message);
  }
}

/** The one SWR fetcher: JSON in, an ApiError on any non-2xx answer. API URLs are the SWR keys. */
export async function fetcher<T = unknown>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: 'application/json' } });
  return readResponse<T>(res);
}

export async function readResponse<T>(res: Response): Promise<T> {
  const body = await res.json().catch(() => null);
  if (!res.ok) throw new ApiError(res.status, body?.error ?? `Request failed (${res.status}).`, body?.problems ?? []);
  return body as T;
}

/** Send JSON with a method; throws ApiError on failure. */
export async function sendJson<T = unknown>(url: string, method: 'POST' | 'PUT' | 'PATCH' | 'DELETE', body?: unknown): Promise<T> {
  const res = await fetch(url, {
    method,
    headers: { 'content-type': 'application/json', accept: 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return readResponse<T>(res);
}
