import 'server-only';
import type { AddressInfo } from 'node:net';
import type { Knex } from 'knex';
import { SMTPServer } from 'smtp-server';
import { db } from '@/lib/db';
import { nowIso } from '@/lib/time';
import { readMailConfig, WORKSPACE_HEADER } from './config';
import { parseMail } from './parse';
import { setOutboxKicksForTests } from './queue';

export type MailSink = { port: number; stop: () => Promise<void> };

// One sink per server process, shared by instrumentation and route bundles through globalThis.
const holder = globalThis as unknown as { __haulcaseMailSink?: Promise<MailSink> };

const MAX_BYTES = 5 * 1024 * 1024;

/**
 * A real SMTP server on loopback that accepts every message (no TLS, no auth:
 * it only ever listens on 127.0.0.1) and stores it, parsed, in `mail_sink`.
 * `port: 0` picks a free port. `k` defaults to the app's database.
 */
export function startMailSink(opts: { port?: number; k?: () => Knex } = {}): Promise<MailSink> {
  const knex = opts.k ?? db;
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: MAX_BYTES,
    banner: 'Haulcase local mail sink',
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', async () => {
        try {
          const mail = parseMail(Buffer.concat(chunks).toString('utf8'));
          await knex()('mail_sink').insert({
            workspaceSlug: mail.headers[WORKSPACE_HEADER.toLowerCase()] || null,
            fromAddress: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            toAddresses: JSON.stringify(session.envelope.rcptTo.map((r) => r.address)),
            subject: mail.subject.slice(0, 500),
            text: mail.text,
            html: mail.html,
            receivedAt: nowIso(),
          });
          callback();
        } catch (err) {
          console.error('[haulcase] mail sink could not store a message:', err);
          callback(new Error('Could not store the message'));
        }
      });
    },
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, '127.0.0.1', () => {
      const port = (server.server.address() as AddressInfo).port;
      resolve({ port, stop: () => new Promise<void>((r) => server.close(() => r())) });
    });
  });
}

/** The process's sink, started on first use (and at boot by instrumentation.ts). */
export function ensureMailSink(): Promise<MailSink> {
  if (!holder.__haulcaseMailSink) {
    holder.__haulcaseMailSink = startMailSink({ port: readMailConfig().port }).catch((err) => {
      holder.__haulcaseMailSink = undefined;
      throw err;
    });
  }
  return holder.__haulcaseMailSink;
}

/**
 * Tests use their own sink; this makes lib/mail send to it, and makes the
 * send after each commit finish before the request answers
 * (`setOutboxKicksForTests('await')`), so a test reads the mail right after.
 */
export function useMailSinkForTests(sink: MailSink | undefined): void {
  holder.__haulcaseMailSink = sink ? Promise.resolve(sink) : undefined;
  setOutboxKicksForTests(sink ? 'await' : 'background');
}
