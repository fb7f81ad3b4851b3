import 'server-only';
import { randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';
import type { ReadableStream as NodeWebStream } from 'node:stream/web';
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { invalid, notFound } from '@/lib/http';
import { getStorage } from '@/lib/storage';
import { cleanFileName, DOCUMENT_MAX_BYTES, sniffDocumentType } from '@/lib/storage/file-types';
import { nowIso } from '@/lib/time';
import { insertReturningId } from '@/lib/api/crud';

const COLUMNS = ['id', 'offerId', 'fileName', 'contentType', 'size', 'uploadedBy', 'createdAt'];

export async function findOffer(k: Knex, workspaceId: number, offerId: number) {
  const o = await k('repower_offers').where({ id: offerId, workspaceId }).first('id', 'key');
  if (!o) throw notFound('No such repower offer in this workspace.');
  return o as { id: number; key: string };
}

export async function listQuoteDocuments(workspaceId: number, offerId: number) {
  await findOffer(db(), workspaceId, offerId);
  return db()('quote_documents').where({ workspaceId, offerId }).orderBy('id').select(COLUMNS);
}

/**
 * Checks size and real type (from the first bytes), streams the bytes to the
 * storage (lib/storage: local disk or S3), then records the row and its audit
 * entry in one transaction; if that fails the stored bytes are removed, so
 * there is never a row without its file.
 */
export async function saveQuoteDocument(access: Access, offerId: number, file: File | null) {
  const wsId = access.workspace.id;
  await findOffer(db(), wsId, offerId);
  if (!file || typeof file === 'string') throw invalid([{ path: 'file', message: 'Choose a file to upload (form field "file").' }]);
  if (file.size === 0) throw invalid([{ path: 'file', message: 'The file is empty.' }]);
  if (file.size > DOCUMENT_MAX_BYTES) {
    throw invalid([{ path: 'file', message: `The file is ${(file.size / 1048576).toFixed(1)} MB; the limit is 10 MB.` }]);
  }
  const type = sniffDocumentType(new Uint8Array(await file.slice(0, 16).arrayBuffer()));
  if (!type) throw invalid([{ path: 'file', message: `"${cleanFileName(file.name)}" is not a PDF, PNG, JPEG or WebP file (checked from its contents, not its name).` }]);
  const storageKey = `ws${wsId}/offer${offerId}/${randomUUID()}`;
  const storage = getStorage();
  await storage.put(storageKey, Readable.fromWeb(file.stream() as NodeWebStream<Uint8Array>), file.size);
  try {
    return await db().transaction(async (trx) => {
      const row = { workspaceId: wsId, offerId, fileName: cleanFileName(file.name), contentType: type.contentType, size: file.size, storageKey, uploadedBy: access.userId, createdAt: nowIso() };
      const id = await insertReturningId(trx, 'quote_documents', row);
      await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'upload', entity: 'quote_document', entityId: id, after: { offerId, fileName: row.fileName, contentType: row.contentType, size: row.size } });
      return trx('quote_documents').where({ id }).first(COLUMNS);
    });
  } catch (e) {
    await storage.delete(storageKey);
    throw e;
  }
}

export async function findQuoteDocument(workspaceId: number, offerId: number, docId: number) {
  const doc = await db()('quote_documents').where({ id: docId, offerId, workspaceId }).first();
  if (!doc) throw notFound('No such document for this offer.');
  return doc;
}

export async function deleteQuoteDocument(access: Access, offerId: number, docId: number) {
  const doc = await findQuoteDocument(access.workspace.id, offerId, docId);
  await db().transaction(async (trx) => {
    await trx('quote_documents').where({ id: doc.id }).delete();
    await writeAudit(trx, { workspaceId: access.workspace.id, userId: access.userId, action: 'delete', entity: 'quote_document', entityId: doc.id, before: { offerId, fileName: doc.fileName, size: doc.size } });
  });
  // After the commit: a failed delete of bytes leaves an orphan file, never a row without its file.
  await getStorage().delete(doc.storageKey);
}
