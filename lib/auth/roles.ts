import { z } from 'zod';

export const ROLES = ['admin', 'analyst', 'approver', 'viewer'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** Who may do what, by role within one workspace. */
export const CAN = {
  read: ROLES,
  /** Fleet data, assumption sets, business cases: create, edit, delete, submit. */
  edit: ['admin', 'analyst'],
  /** Approve, reject or return a submitted case. */
  decide: ['approver', 'admin'],
  /**
   * Read the audit log: who changed what, when. Admins, approvers (who judge a
   * case on the data behind it) and analysts (who keep that data); not viewers.
   * Only admins see members' e-mail addresses in it; the others see names.
   */
  audit: ['admin', 'approver', 'analyst'],
  /** Members, invitations, workspace settings, outbox. */
  administer: ['admin'],
} as const satisfies Record<string, readonly Role[]>;

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  analyst: 'Analyst',
  approver: 'Approver',
  viewer: 'Viewer',
};
