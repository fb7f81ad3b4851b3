import { Readable } from 'node:stream';
import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { idParam, idParams, notFound, readParams, route } from '@/lib/http';
import { deleteQuoteDocument, findQuoteDocument } from '@/lib/db/queries/quote-documents';
import { getStorage } from '@/lib/storage';

type P = { workspace: string; id: string; docId: string };

/** The offer's id and the document's. */
const docParams = idParams.extend({ docId: idParam });

/** GET: download (members of the workspace only; the bytes are never served from a public folder). */
export const GET = route<P>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const { id, docId } = readParams(docParams, p);
  const doc = await findQuoteDocument(access.workspace.id, id, docId);
  const stored = await getStorage().get(doc.storageKey);
  if (!stored) throw notFound('The stored file is missing.');
  // streamed from the disk or the bucket as it is read, never held whole
  return new NextResponse(Readable.toWeb(stored.body) as ReadableStream<Uint8Array>, {
    headers: {
      'content-type': doc.contentType,
      'content-length': String(stored.size),
      'content-disposition': `attachment; filename="${doc.fileName.replace(/[^\x20-\x7e]/g, '_')}"; filename*=UTF-8''${encodeURIComponent(doc.fileName)}`,
      'x-content-type-options': 'nosniff',
      'cache-control': 'private, no-store',
    },
  });
});

/** DELETE: remove a document (analyst, admin). */
export const DELETE = route<P>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id, docId } = readParams(docParams, p);
  await deleteQuoteDocument(access, id, docId);
  return new NextResponse(null, { status: 204 });
});
