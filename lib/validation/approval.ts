import { z } from '@/lib/validation/zod';
import { stripControlCharacters, stripControlKeepingLines } from './control-characters';
import { DECISIONS } from '@/lib/approvals/workflow';
import { roleSchema } from '@/lib/auth/roles';

const comment = z.string().overwrite(stripControlKeepingLines).trim().max(4000, 'Keep the comment under 4,000 characters.').default('');
const version = z.number().int().positive().optional();

/** Body of POST …/cases/[id]/submit. */
export const submitSchema = z.strictObject({ comment, version });

/** Body of POST …/cases/[id]/decisions. */
export const decisionSchema = z.strictObject({
  decision: z.enum(DECISIONS, { message: 'Choose approve, reject or return.' }),
  comment,
  version,
});

/** Body of POST …/invitations. */
export const invitationSchema = z.strictObject({
  email: z.string().trim().toLowerCase().email('Enter a valid email address.').max(320),
  role: roleSchema,
});

const password = z.string().min(10, 'Use at least 10 characters.').max(200, 'Use at most 200 characters.');
const token = z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, 'This link is not valid.');

/** Body of POST /api/invitations/accept: a name and password for a new account, nothing for a signed-in one. */
export const acceptInvitationSchema = z.strictObject({
  token,
  name: z.string().overwrite(stripControlCharacters).trim().min(1, 'Enter your name.').max(200).optional(),
  password: password.optional(),
});

export const forgotPasswordSchema = z.strictObject({ email: z.string().trim().toLowerCase().email('Enter a valid email address.').max(320) });
export const resetPasswordSchema = z.strictObject({ token, password });

/** Body of PUT …/settings/approvals: how many distinct people must approve a case. */
export const approvalsSettingSchema = z.strictObject({
  approvalsRequired: z.number({ error: 'Enter a whole number.' }).int('Enter a whole number.').min(1, 'At least one approval is needed.').max(10, 'At most 10.'),
});
