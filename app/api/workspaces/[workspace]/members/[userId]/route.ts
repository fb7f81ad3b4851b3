import { NextResponse } from 'next/server';
import { changeMemberRole, removeMember } from '@/lib/accounts/members';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { versionFromQuery } from '@/lib/api/crud';
import { notFound, parseOr422, readJson, route } from '@/lib/http';
import { memberIdParam, memberRoleChangeSchema } from '@/lib/validation/members';

type Params = { workspace: string; userId: string };

const parseUserId = (raw: string) => {
  const r = memberIdParam.safeParse(raw);
  if (!r.success) throw notFound('No such member in this workspace.');
  return r.data;
};

/** PATCH { role, version }: change a member's role (admins). 409 when stale or when it would leave no admin. */
export const PATCH = route<Params>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.administer);
  const userId = parseUserId(p.userId);
  const body = parseOr422(memberRoleChangeSchema, await readJson(req));
  return NextResponse.json(await changeMemberRole(access, userId, body));
});

/** DELETE ?version=N: remove a member from this workspace (admins). 409 when stale or for the last admin. */
export const DELETE = route<Params>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.administer);
  const userId = parseUserId(p.userId);
  await removeMember(access, userId, versionFromQuery(req));
  return new NextResponse(null, { status: 204 });
});
