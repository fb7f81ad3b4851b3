import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { cachedResultBody } from '@/lib/cases/result-cache';
import { idParams, readParams, route } from '@/lib/http';

/**
 * GET: the case evaluated on the server — `result` is the engine's
 * case-result/1 without each policy's by-year breakdown (the truck route has
 * the per-period detail), beside it the ranking, capital plan, swap schedule,
 * fleet summary, proposal and each truck's event timeline. 422 lists what
 * stops evaluation.
 *
 * The answer is cached by everything it reads (lib/cases/result-cache.ts)
 * and carries that key as its ETag: `If-None-Match` with it answers 304.
 * `private, no-cache`: a browser keeps it and revalidates on every use.
 */
export const GET = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const { etag, body } = await cachedResultBody(access, readParams(idParams, p).id, req.headers.get('if-none-match'));
  const headers = { ETag: etag, 'Cache-Control': 'private, no-cache', Vary: 'Cookie' };
  if (body === null) return new Response(null, { status: 304, headers });
  return new Response(body, { status: 200, headers: { ...headers, 'Content-Type': 'application/json' } });
});
