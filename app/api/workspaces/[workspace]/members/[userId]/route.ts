import { NextResponse } from 'next/server';
import { changeMemberRole, removeMember } from '@/lib/accounts/members';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { versionFromQuery } from '@/lib/api/crud';
import { idParam, parseOr422, readJson, readParams, route } from '@/lib/http';
import { memberRoleChangeSchema } from '@/lib/validation/members';
import { z } from '@/lib/validation/zod';

type Params = { workspace: string; userId: string };

const memberParams = z.object({ userId: idParam });

/** PATCH { role, version }: change a member's role (admins). 409 when stale or when it would leave no admin. */
export const PATCH = route<Params>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.administer);
  const { userId } = readParams(memberParams, p);
  const body = parseOr422(memberRoleChangeSchema, await readJson(req));
  return NextResponse.json(await changeMemberRole(access, userId, body));
});

/** DELETE ?version=N: remove a member from this workspace (admins). 409 when stale or for the last admin. */
export const DELETE = route<Params>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.administer);
  const { userId } = readParams(memberParams, p);
  await removeMember(access, userId, versionFromQuery(req));
  return new NextResponse(null, { status: 204 });
});
