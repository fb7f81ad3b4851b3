import { z } from '@/lib/validation/zod';
import { ROLES } from '@/lib/auth/roles';

/** Body of PATCH …/members/[userId]: the new role and the membership version the admin loaded. */
export const memberRoleChangeSchema = z.strictObject({
  role: z.enum(ROLES, { message: 'Choose admin, analyst, approver or viewer.' }),
  version: z.number('must be the version you loaded').int().min(1),
});
