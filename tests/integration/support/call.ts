type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

/**
 * Calls a route handler as Next would, and reads its JSON answer. Like the app's
 * own pages, it sends `Origin` (the URL's) and `Content-Type: application/json`
 * (none for FormData, whose boundary the body sets) unless `headers` says otherwise.
 */
export async function call<P extends Record<string, string>>(
  handler: Handler<P>,
  params: P,
  init: { method?: string; body?: unknown; url?: string; headers?: Record<string, string> } = {},
): Promise<{ status: number; body: any; response: Response }> {
  const hasBody = init.body !== undefined;
  const url = init.url ?? 'http://127.0.0.1/api/test';
  const req = new Request(url, {
    method: init.method ?? (hasBody ? 'POST' : 'GET'),
    headers: { origin: new URL(url).origin, ...(init.body instanceof FormData ? {} : { 'content-type': 'application/json' }), ...init.headers },
    body: hasBody ? (init.body instanceof FormData || typeof init.body === 'string' ? (init.body as BodyInit) : JSON.stringify(init.body)) : undefined,
  });
  const response = await handler(req, { params: Promise.resolve(params) });
  const text = await response.clone().text();
  let body: any = text;
  try {
    body = JSON.parse(text);
  } catch {
    /* not JSON */
  }
  return { status: response.status, body, response };
}
