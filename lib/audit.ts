import type { Knex } from 'knex';
import { nowIso } from './time';

export type AuditEntry = {
  workspaceId: number | null;
  userId: number | null;
  /** verb: create, update, delete, import, submit, approve, … */
  action: string;
  /** table or concept: truck, engine_type, business_case, membership, … */
  entity: string;
  entityId?: string | number | null;
  before?: unknown;
  after?: unknown;
};

/**
 * Writes one audit row. Call it inside the same transaction as the change it
 * records, so that a change and its audit row are saved together or not at all.
 */
export async function writeAudit(k: Knex | Knex.Transaction, e: AuditEntry): Promise<void> {
  await k('audit_log').insert({
    workspaceId: e.workspaceId,
    userId: e.userId,
    action: e.action,
    entity: e.entity,
    entityId: e.entityId == null ? null : String(e.entityId),
    before: e.before === undefined ? null : JSON.stringify(e.before),
    after: e.after === undefined ? null : JSON.stringify(e.after),
    at: nowIso(),
  });
}
