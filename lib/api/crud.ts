import 'server-only';
import type { Knex } from 'knex';
import { NextResponse } from 'next/server';
import type { z } from 'zod';
import { requireMember, type Access } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { conflict, idParams, invalid, notFound, parseOr422, readJson, readParams, route } from '@/lib/http';
import { getStorage } from '@/lib/storage';
import { nowIso } from '@/lib/time';

type Row = Record<string, unknown>;

/** What differs between the register's entities; the handlers below do the rest the same way. */
export type EntityConfig = {
  table: string;
  /** Audit entity name. */
  entity: string;
  /** "truck", "engine type": used in messages. */
  label: string;
  createSchema: z.ZodType;
  updateSchema: z.ZodType;
  /** The column unique within a workspace (unit number, key, name) and its field name in the body. */
  uniqueField: string;
  list: (k: Knex, workspaceId: number) => Promise<Row[]>;
  read: (k: Knex, workspaceId: number, id: number) => Promise<Row | null>;
  /** Body → columns; checks references belong to the workspace (422 otherwise). */
  toRow: (k: Knex, workspaceId: number, input: Row) => Promise<Row>;
  /** Refuse a delete that would break other rows (409). */
  beforeDelete?: (k: Knex, workspaceId: number, id: number) => Promise<void>;
  /** Storage keys of files that go with the row (its rows cascade); removed once the delete has committed. */
  storedFiles?: (k: Knex, workspaceId: number, id: number) => Promise<string[]>;
};

type Params = { workspace: string };
type ItemParams = { workspace: string; id: string };

/**
 * The `?version=N` a DELETE must carry: the version the caller loaded, so a
 * delete of a row someone changed meanwhile answers 409 like a stale update.
 * Missing or not a whole number: 422 with the path `version`.
 */
export function versionFromQuery(req: Request): number {
  const raw = new URL(req.url).searchParams.get('version');
  if (raw === null) throw invalid([{ path: 'version', message: 'is required: send the version you loaded (?version=N)' }]);
  if (!/^\d{1,12}$/.test(raw) || Number(raw) < 1) throw invalid([{ path: 'version', message: 'must be the version you loaded, a whole number' }]);
  return Number(raw);
}

export async function insertReturningId(k: Knex, table: string, values: Row): Promise<number> {
  const [row] = await k(table).insert(values).returning('id');
  return typeof row === 'object' ? row.id : row;
}

async function assertUnique(k: Knex, cfg: EntityConfig, workspaceId: number, value: unknown, exceptId?: number) {
  let q = k(cfg.table).where({ workspaceId, [cfg.uniqueField]: value });
  if (exceptId !== undefined) q = q.whereNot({ id: exceptId });
  if (await q.first('id')) {
    throw invalid([{ path: cfg.uniqueField, message: `"${String(value)}" is already used by another ${cfg.label} in this workspace` }]);
  }
}

/**
 * Runs after the commit, so a rolled-back delete never loses a file; a file that
 * cannot be removed is logged and left as an orphan, never a row without its file.
 */
async function removeStoredFiles(keys: string[]) {
  const storage = getStorage();
  for (const key of keys) {
    try {
      await storage.delete(key);
    } catch (e) {
      console.error(`[haulcase] could not remove stored file ${key}:`, e);
    }
  }
}

const stamp = (access: Access, now: string) => ({ updatedBy: access.userId, updatedAt: now });

export function collectionHandlers(cfg: EntityConfig) {
  const GET = route<Params>(async (_req, { params }) => {
    const access = await requireMember((await params).workspace, CAN.read);
    return NextResponse.json({ items: await cfg.list(db(), access.workspace.id) });
  });

  const POST = route<Params>(async (req, { params }) => {
    const access = await requireMember((await params).workspace, CAN.edit);
    const input = parseOr422(cfg.createSchema, await readJson(req)) as Row;
    const wsId = access.workspace.id;
    const id = await db().transaction(async (trx) => {
      const row = await cfg.toRow(trx, wsId, input);
      await assertUnique(trx, cfg, wsId, row[cfg.uniqueField]);
      const now = nowIso();
      const newId = await insertReturningId(trx, cfg.table, { workspaceId: wsId, ...row, version: 1, createdBy: access.userId, createdAt: now, ...stamp(access, now) });
      await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'create', entity: cfg.entity, entityId: newId, after: row });
      return newId;
    });
    return NextResponse.json(await cfg.read(db(), wsId, id), { status: 201 });
  });
  return { GET, POST };
}

export function itemHandlers(cfg: EntityConfig) {
  const GET = route<ItemParams>(async (_req, { params }) => {
    const p = await params;
    const access = await requireMember(p.workspace, CAN.read);
    const row = await cfg.read(db(), access.workspace.id, readParams(idParams, p).id);
    if (!row) throw notFound(`No such ${cfg.label} in this workspace.`);
    return NextResponse.json(row);
  });

  const PUT = route<ItemParams>(async (req, { params }) => {
    const p = await params;
    const access = await requireMember(p.workspace, CAN.edit);
    const { id } = readParams(idParams, p);
    const wsId = access.workspace.id;
    const { version, ...input } = parseOr422(cfg.updateSchema, await readJson(req)) as Row & { version: number };
    await db().transaction(async (trx) => {
      const before = await trx(cfg.table).where({ id, workspaceId: wsId }).first();
      if (!before) throw notFound(`No such ${cfg.label} in this workspace.`);
      if (before.version !== version) throw conflict();
      const row = await cfg.toRow(trx, wsId, input);
      await assertUnique(trx, cfg, wsId, row[cfg.uniqueField], id);
      // The version in the WHERE makes a concurrent writer lose cleanly.
      const n = await trx(cfg.table).where({ id, workspaceId: wsId, version }).update({ ...row, version: version + 1, ...stamp(access, nowIso()) });
      if (n !== 1) throw conflict();
      await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'update', entity: cfg.entity, entityId: id, before, after: row });
    });
    return NextResponse.json(await cfg.read(db(), wsId, id));
  });

  const DELETE = route<ItemParams>(async (req, { params }) => {
    const p = await params;
    const access = await requireMember(p.workspace, CAN.edit);
    const { id } = readParams(idParams, p);
    const wsId = access.workspace.id;
    const version = versionFromQuery(req);
    const files = await db().transaction(async (trx) => {
      const before = await trx(cfg.table).where({ id, workspaceId: wsId }).first();
      if (!before) throw notFound(`No such ${cfg.label} in this workspace.`);
      if (before.version !== version) throw conflict();
      if (cfg.beforeDelete) await cfg.beforeDelete(trx, wsId, id);
      const keys = cfg.storedFiles ? await cfg.storedFiles(trx, wsId, id) : [];
      // the version in the WHERE makes a concurrent update win over this delete cleanly
      if ((await trx(cfg.table).where({ id, workspaceId: wsId, version }).delete()) !== 1) throw conflict();
      await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'delete', entity: cfg.entity, entityId: id, before });
      return keys;
    });
    await removeStoredFiles(files);
    return new NextResponse(null, { status: 204 });
  });
  return { GET, PUT, DELETE };
}
