import type { Metadata } from 'next';
import Link from 'next/link';
import { AcceptInvitationForm } from '@/components/auth/accept-invitation-form';
import { JoinInvitation } from '@/components/auth/join-invitation';
import { LinkProblem } from '@/components/auth/link-problem';
import { Notice } from '@/components/ui/notice';
import { PublicShell } from '@/components/ui/public-shell';
import { getPageUser } from '@/lib/auth/session';
import { tokenSchema } from '@/lib/schemas/auth';
import { lookupInvitation } from '@/db/invitations';

export const metadata: Metadata = { title: 'Invitation · Cellwright' };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const lookup = tokenSchema.safeParse(token).success ? await lookupInvitation(token) : ({ state: 'invalid' } as const);
  if (lookup.state !== 'valid') {
    return (
      <PublicShell title="Invitation">
        <LinkProblem state={lookup.state} next={{ href: '/sign-in', label: 'Go to sign-in' }} />
      </PublicShell>
    );
  }
  const invite = lookup.value;
  const intro = (
    <>
      {invite.trainerName} invited <span className="font-mono">{invite.email}</span> to <strong>{invite.cohortName}</strong>.
    </>
  );
  if (invite.existingAccount) {
    const user = await getPageUser();
    return (
      <PublicShell title="Join a cohort" intro={intro}>
        {user && user.email === invite.email ? (
          <JoinInvitation token={token} cohortName={invite.cohortName} />
        ) : (
          <div className="space-y-3">
            <Notice>An account with this address already exists. Sign in with it, then open this link again to join.</Notice>
            <Link href={`/sign-in?callbackUrl=${encodeURIComponent(`/invite/${token}`)}`} className="text-sm font-medium text-accent-700 hover:underline">
              Sign in
            </Link>
          </div>
        )}
      </PublicShell>
    );
  }
  return (
    <PublicShell title="Create your account" intro={intro}>
      <AcceptInvitationForm token={token} email={invite.email} />
    </PublicShell>
  );
}
