import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Knex } from 'knex';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { createTestDb } from '../support/test-db';

describe('building a case file from stored data', () => {
  let k: Knex;
  let destroy: () => Promise<void>;
  beforeAll(async () => ({ k, destroy } = await createTestDb()));
  afterAll(async () => destroy());

  it('gives back the demo scenario the workspace was seeded from', async () => {
    const ws = await k('workspaces').where({ slug: 'aldervane-north-pit' }).first();
    const base = await k('assumption_sets').where({ workspaceId: ws.id, name: 'Base' }).first();
    const built = await buildCaseFile(ws.id, { name: 'Aldervane Copper — North Pit fleet (base)', assumptionSetId: base.id }, k);
    const source = JSON.parse(fs.readFileSync(path.resolve('scenarios/aldervane-north-pit.json'), 'utf8'));
    const byId = <T extends { id: string }>(xs: T[]) => [...xs].sort((a, b) => a.id.localeCompare(b.id));
    expect(built.assumptions).toEqual(source.assumptions);
    expect(byId(built.engines)).toEqual(byId(source.engines));
    expect(byId(built.repowerOffers)).toEqual(byId(source.repowerOffers));
    expect(byId(built.trucks)).toEqual(byId(source.trucks));
  });

  it('takes a selection of trucks with an offer override, and only the engines and offers they use', async () => {
    const ws = await k('workspaces').where({ slug: 'aldervane-north-pit' }).first();
    const base = await k('assumption_sets').where({ workspaceId: ws.id, name: 'High fuel' }).first();
    const t = await k('trucks').where({ workspaceId: ws.id, unitNumber: 'T3-05' }).first();
    const other = await k('repower_offers').where({ workspaceId: ws.id, key: 'brannock-bd2000' }).first();
    const built = await buildCaseFile(ws.id, { name: 'x', assumptionSetId: base.id, truckIds: [t.id], offerOverrides: { [t.id]: other.id } }, k);
    expect(built.trucks.map((x) => [x.id, x.repowerOfferId])).toEqual([['T3-05', 'brannock-bd2000']]);
    expect(built.repowerOffers.map((o) => o.id)).toEqual(['brannock-bd2000']);
    expect(built.engines.map((e) => e.id).sort()).toEqual(['ac-2600-legacy', 'bd-2000-bypass']);
    expect(built.assumptions.fuelPrice).toBe(1.35);
  });
});
