import Link from 'next/link';
import { getInvitationByToken } from '@/lib/workspaces/service';
import { getUserByEmail } from '@/db/users';
import { currentUser } from '@/lib/auth/session';
import { ROLE_LABELS } from '@/lib/auth/policy';
import { Notice } from '@/components/ui/notice';
import { SignUpForm } from '../../signup/sign-up-form';
import { AcceptInvitationButton } from './accept-button';

export const metadata = { title: 'Invitation' };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const inv = await getInvitationByToken(token);
  if (inv.state !== 'open') {
    const text =
      inv.state === 'expired'
        ? 'This invitation has expired. Ask the workspace owner to send a new one.'
        : inv.state === 'used'
          ? 'This invitation has already been used.'
          : 'This invitation does not exist or was withdrawn.';
    return (
      <>
        <h1 className="text-xl font-semibold">Invitation</h1>
        <div className="mt-4">
          <Notice tone="caution">{text}</Notice>
        </div>
      </>
    );
  }
  const [user, account] = await Promise.all([currentUser(), getUserByEmail(inv.email)]);
  return (
    <>
      <h1 className="text-xl font-semibold">Join {inv.workspace.name}</h1>
      <p className="mt-1 text-sm text-ink-soft">
        You are invited as <strong>{ROLE_LABELS[inv.role]}</strong> ({inv.email}).
      </p>
      <div className="mt-5">
        {user && user.email === inv.email ? (
          <AcceptInvitationButton token={token} />
        ) : user ? (
          <Notice tone="caution">
            You are signed in as {user.email}, but the invitation is for {inv.email}. Sign out and sign in with the
            invited address.
          </Notice>
        ) : account ? (
          <Link
            className="text-accent underline"
            href={`/signin?callbackUrl=${encodeURIComponent(`/invite/${token}`)}`}
          >
            Sign in as {inv.email} to accept
          </Link>
        ) : (
          <SignUpForm invitationToken={token} invitedEmail={inv.email} />
        )}
      </div>
    </>
  );
}
