import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { BODY_LIMITS, idParams, readForm, readParams, route } from '@/lib/http';
import { listQuoteDocuments, saveQuoteDocument } from '@/lib/db/queries/quote-documents';

type P = { workspace: string; id: string };

/** GET: the offer's quote documents (any member). */
export const GET = route<P>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  return NextResponse.json({ items: await listQuoteDocuments(access.workspace.id, readParams(idParams, p).id) });
});

/** POST multipart (field "file"): PDF, PNG, JPEG or WebP up to 10 MB (analyst, admin). */
export const POST = route<P>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id: offerId } = readParams(idParams, p);
  const form = await readForm(req, 'Send the document as multipart/form-data with a "file" field.');
  const doc = await saveQuoteDocument(access, offerId, form.get('file') as File | null);
  return NextResponse.json(doc, { status: 201 });
}, { body: 'multipart', limit: BODY_LIMITS.quoteDocument });
