import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';
import { AcceptWithNewAccount, JoinButton, SignOutAndReturn } from '@/components/auth/accept-invitation';
import { SignInForm } from '@/components/auth/sign-in-form';
import { Notice } from '@/components/ui/notice';
import { getSessionUser } from '@/lib/auth';
import { withArticle } from '@/lib/auth/roles';
import { INVITATION_MESSAGES, lookupInvitation } from '@/lib/members/invitations';

export const metadata: Metadata = { title: 'Invitation', referrer: 'no-referrer' };
export const dynamic = 'force-dynamic';

const TITLES = {
  invalid: 'This invitation link does not work',
  revoked: 'This invitation was withdrawn',
  accepted: 'This invitation was already used',
  expired: 'This invitation has expired',
} as const;

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const user = await getSessionUser();
  const lookup = await lookupInvitation(token, user);

  if (lookup.state !== 'ok') {
    return (
      <AuthCard title={TITLES[lookup.state]} footer={<Link href="/">About Tallyvat</Link>}>
        {lookup.state !== 'invalid' ? (
          <p className="mb-3 text-stone-700">
            Co-op: <strong>{lookup.coopName}</strong>
          </p>
        ) : null}
        <Notice tone="warn">{INVITATION_MESSAGES[lookup.state]}</Notice>
        <p className="mt-4 text-sm">
          {user ? <Link href="/coops">Go to my co-ops</Link> : <Link href="/sign-in">Sign in</Link>}
        </p>
      </AuthCard>
    );
  }

  const { info } = lookup;
  return (
    <AuthCard title={`Join ${info.coop.name}`}>
      <div className="mb-5 flex flex-col gap-2 text-stone-700">
        <p>
          {info.invitedBy ? <>{info.invitedBy} invited </> : <>You invited </>}
          <strong>{info.email}</strong> to join <strong>{info.coop.name}</strong> on Tallyvat as{' '}
          <strong>{withArticle(info.role)}</strong>.
        </p>
        <p className="text-sm">
          As {withArticle(info.role)} you can {info.roleSummary}.
        </p>
      </div>
      {info.account === 'new' ? <AcceptWithNewAccount token={token} email={info.email} /> : null}
      {info.account === 'signed-in' ? <JoinButton token={token} coopName={info.coop.name} /> : null}
      {info.account === 'sign-in-needed' ? (
        <div className="flex flex-col gap-3">
          <p className="text-sm text-stone-700">
            You already have a Tallyvat account with this address. Sign in to accept.
          </p>
          <SignInForm next={`/invite/${token}`} email={info.email} />
          <p className="text-sm">
            <Link href="/reset-password">Forgot your password?</Link>
          </p>
        </div>
      ) : null}
      {info.account === 'other-account' ? (
        <div className="flex flex-col gap-3">
          <Notice tone="warn">
            This invitation is for {info.email}, but you are signed in as {info.signedInAs}. Sign out, then sign in or
            create the account for {info.email}.
          </Notice>
          <SignOutAndReturn token={token} />
        </div>
      ) : null}
    </AuthCard>
  );
}
