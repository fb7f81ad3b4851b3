import type { Metadata } from 'next';
import { describeInvitation } from '@/lib/accounts/invitations';
import { getSessionUserId } from '@/lib/auth/session';
import { ROLE_LABELS } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { HttpError } from '@/lib/http';
import { AuthCard } from '../../auth-card';
import { AcceptForm } from './accept-form';

export const metadata: Metadata = { title: 'Accept an invitation' };
export const dynamic = 'force-dynamic';

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let invite: Awaited<ReturnType<typeof describeInvitation>>;
  try {
    invite = await describeInvitation(token);
  } catch (err) {
    if (!(err instanceof HttpError)) throw err;
    return (
      <AuthCard title="This invitation cannot be used">
        <p role="alert" className="card p-4 text-sm" data-testid="invite-error">{err.message} An admin of the workspace can send a new invitation.</p>
      </AuthCard>
    );
  }
  const userId = await getSessionUserId();
  const me = userId ? await db()('users').where({ id: userId }).first('email') : null;
  const intro = <>You are invited to <strong>{invite.workspaceName}</strong> as {ROLE_LABELS[invite.role].toLowerCase()}, as {invite.email}.</>;
  if (invite.accountExists && me?.email !== invite.email) {
    return (
      <AuthCard title="Join a workspace" intro={intro}>
        <div className="card space-y-3 p-5 text-sm">
          <p>{me ? `You are signed in as ${me.email}. ` : ''}An account for {invite.email} already exists: sign in with it, and this page will let you join.</p>
          <a className="btn btn-primary" href={`/sign-in?callbackUrl=${encodeURIComponent(`/invite/${token}`)}`}>Sign in as {invite.email}</a>
        </div>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Join a workspace" intro={intro}>
      <AcceptForm token={token} email={invite.email} slug={invite.slug} newAccount={!invite.accountExists} />
    </AuthCard>
  );
}
