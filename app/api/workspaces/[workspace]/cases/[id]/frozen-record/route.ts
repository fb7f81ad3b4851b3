import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { hashedBytes } from '@/lib/approvals/canonical';
import { db } from '@/lib/db';
import { idParams, notFound, readParams, route } from '@/lib/http';

/**
 * GET: the exact bytes the approval's SHA-256 covers, as a download, so anyone
 * can recompute the hash (`sha256sum case-N-frozen-record.json`). A record is
 * one canonical JSON text (`frozen-record/1`); a case approved before records
 * were kept gives its case and result texts joined by a newline, as hashed.
 * 404 until the case is approved. Any member may download it.
 */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const { id: caseId } = readParams(idParams, p);
  const row = await db()('business_cases').where({ id: caseId, workspaceId: access.workspace.id }).first('frozenCase', 'frozenResult', 'frozenRecord', 'frozenHash');
  if (!row) throw notFound('No such business case in this workspace.');
  const text = hashedBytes(row);
  if (!text || !row.frozenHash) throw notFound('This case has no frozen record: it is frozen when it is approved.');
  const bytes = new TextEncoder().encode(text);
  return new Response(bytes, {
    headers: {
      'content-type': row.frozenRecord ? 'application/json' : 'application/x-ndjson',
      'content-disposition': `attachment; filename="case-${caseId}-frozen-record.json"`,
      'content-length': String(bytes.byteLength),
      'x-frozen-hash': row.frozenHash,
      'cache-control': 'no-store',
    },
  });
});
