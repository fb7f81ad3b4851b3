/**
 * The break-even analysis in a worker thread (lib/sensitivity/break-even-off-thread.ts):
 * the same answer as on the request thread, number for number, and the same
 * refusal (status, problems) for a bad request.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { validateCase, type CaseFile } from '@/lib/engine';
import { HttpError } from '@/lib/http';
import { runBreakEven } from '@/lib/risk/requests';
import { bundleForNode } from '@/lib/risk/build-worker';
import { runBreakEvenOffThread } from '@/lib/sensitivity/break-even-off-thread';
import { breakEvenRequestSchema } from '@/lib/validation/risk';

const root = path.resolve(__dirname, '../../..');
const v = validateCase(JSON.parse(readFileSync(path.join(root, 'scenarios/aldervane-north-pit.json'), 'utf8')));
if (!v.ok) throw new Error('demo case invalid');
const demo = v.value as CaseFile;

beforeAll(async () => {
  const out = path.join(mkdtempSync(path.join(os.tmpdir(), 'haulcase-be-')), 'break-even-worker.cjs');
  process.env.HAULCASE_BREAK_EVEN_WORKER = await bundleForNode(path.join(root, 'lib/sensitivity/break-even-entry.ts'), out, root);
}, 120_000);

describe('break-even off the request thread', () => {
  it('answers what the request thread answers', async () => {
    const body = breakEvenRequestSchema.parse({ metric: { kind: 'fleet-delta' }, drivers: ['modulePrice@kestrel-km2700', 'fuelPrice', 'weibullScaleHours@ac-2600-legacy'] });
    const off = await runBreakEvenOffThread(demo, null, body);
    expect(off).toEqual(runBreakEven(demo, null, body));
    expect(off.rows).toHaveLength(3);
  }, 120_000);

  it('refuses a bad request with the same status and problems', async () => {
    const body = breakEvenRequestSchema.parse({ metric: { kind: 'truck-delta', truckId: 'NOPE' }, drivers: ['fuelPrice', 'modulePrice@nope'] });
    const err = await runBreakEvenOffThread(demo, null, body).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(HttpError);
    expect((err as HttpError).status).toBe(422);
    let direct: unknown;
    try {
      runBreakEven(demo, null, body);
    } catch (e) {
      direct = e;
    }
    expect((err as HttpError).problems).toEqual((direct as HttpError).problems);
    expect((err as HttpError).problems!.map((p) => p.path)).toEqual(expect.arrayContaining(['metric.truckId', 'drivers[1]']));
  }, 120_000);
});
