import 'server-only';
import { db } from '../db';
import { forbidden, unauthorized } from '../http';
import type { NumberFormat } from '../number-input';
import { CAN, type Role } from './roles';
import { getSessionUserId } from './session';

export type WorkspaceSettings = {
  units: 'metric' | 'us';
  negativeStyle: 'parentheses' | 'minus';
  approvalsRequired: number;
  /** month (1..12) the fiscal year starts in; a fiscal year is named after the calendar year it ends in */
  fiscalYearStartMonth: number;
  /** how numbers are typed and imported: 18,950.5 (point) or 18.950,5 (comma); lib/number-input.ts */
  numberFormat: NumberFormat;
  /** plan against actual: hours or burn beyond ± this many percent of the approved case are flagged (default 5) */
  actualsTolerancePercent: number;
};

export type Workspace = { id: number; slug: string; name: string; currency: string; settings: WorkspaceSettings };

export type Access = { userId: number; workspace: Workspace; role: Role };

const DEFAULT_SETTINGS: WorkspaceSettings = { units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 1, fiscalYearStartMonth: 1, numberFormat: 'point', actualsTolerancePercent: 5 };

export function parseSettings(text: string | null | undefined): WorkspaceSettings {
  try {
    const s: WorkspaceSettings = { ...DEFAULT_SETTINGS, ...(text ? JSON.parse(text) : {}) };
    const m = s.fiscalYearStartMonth;
    // a stored value out of range (never written by the settings route) reads as the default
    const tol = s.actualsTolerancePercent;
    const t = typeof tol === 'number' && Number.isFinite(tol) && tol >= 0.1 && tol <= 100 ? s : { ...s, actualsTolerancePercent: 5 };
    return Number.isInteger(m) && m >= 1 && m <= 12 ? t : { ...t, fiscalYearStartMonth: 1 };
  } catch {
    return DEFAULT_SETTINGS;
  }
}

/** The caller's membership of a workspace, read from the database (never from the token). */
export async function findMembership(userId: number, slug: string): Promise<Access | null> {
  const row = await db()('memberships as m')
    .join('workspaces as w', 'w.id', 'm.workspaceId')
    .where({ 'm.userId': userId, 'w.slug': slug })
    .first('w.id', 'w.slug', 'w.name', 'w.currency', 'w.settings', 'm.role');
  if (!row) return null;
  return {
    userId,
    role: row.role as Role,
    workspace: { id: row.id, slug: row.slug, name: row.name, currency: row.currency, settings: parseSettings(row.settings) },
  };
}

/**
 * The one access check for route handlers and server actions: the signed-in
 * user (401 if none) must be a member of the workspace `slug` (403 otherwise,
 * also for a workspace that does not exist, so ids of others are not revealed)
 * with one of the `allowed` roles (403).
 */
export async function requireMember(slug: string, allowed: readonly Role[] = CAN.read): Promise<Access> {
  const userId = await getSessionUserId();
  if (userId === null) throw unauthorized();
  const access = await findMembership(userId, slug);
  if (!access) throw forbidden('You are not a member of this workspace.');
  if (!allowed.includes(access.role)) throw forbidden();
  return access;
}

export const hasRole = (access: Access, allowed: readonly Role[]) => allowed.includes(access.role);

/** The workspaces the user belongs to, for the switcher. */
export async function listUserWorkspaces(userId: number): Promise<Array<{ slug: string; name: string; role: Role }>> {
  return db()('memberships as m')
    .join('workspaces as w', 'w.id', 'm.workspaceId')
    .where('m.userId', userId)
    .orderBy('w.name')
    .select('w.slug', 'w.name', 'm.role');
}
