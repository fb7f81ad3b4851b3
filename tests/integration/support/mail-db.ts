import { inject } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { startMailSink, useMailSinkForTests, type MailSink } from '@/lib/mail/sink';
import { createTestDb, userIds } from '../../support/test-db';

export type MailDb = { k: Knex; sink: MailSink; ids: Record<string, number>; close: () => Promise<void> };

/**
 * A seeded database the app's queries use, and a real SMTP sink that receives
 * whatever the app sends (no mocked transport); `close` undoes both.
 */
export async function openMailDb(pg: boolean): Promise<MailDb> {
  const { k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
  useDbForTests(k);
  const sink = await startMailSink({ k: () => k });
  useMailSinkForTests(sink);
  return {
    k,
    sink,
    ids: await userIds(k),
    close: async () => {
      useMailSinkForTests(undefined);
      await sink.stop();
      await destroy();
    },
  };
}
