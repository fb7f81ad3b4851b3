import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { notFound, route } from '@/lib/http';
import { fetchOutbox, fetchOutboxQueue, outboxEnabled } from '@/lib/mail/outbox';

/** GET: messages the local SMTP sink received for this workspace, and its mail not sent yet or given up (admins; 404 when real SMTP is configured). */
export const GET = route<{ workspace: string }>(async (_req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.administer);
  if (!outboxEnabled()) throw notFound('The outbox exists only while the local mail sink is in use.');
  return NextResponse.json({ messages: await fetchOutbox(access.workspace.id, access.workspace.slug), queued: await fetchOutboxQueue(access.workspace.slug) });
});
