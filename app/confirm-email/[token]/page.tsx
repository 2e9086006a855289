import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';
import { ConfirmEmailButton } from '@/components/account/profile-forms';
import { Notice } from '@/components/ui/notice';
import { lookupEmailChange } from '@/lib/account';

export const metadata: Metadata = { title: 'Confirm your new e-mail address', referrer: 'no-referrer' };
export const dynamic = 'force-dynamic';

/**
 * The link e-mailed to a new address. Confirming takes a click (a POST), so mail scanners that
 * fetch links do not use up the single-use token.
 */
export default async function ConfirmEmailPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await lookupEmailChange(token);
  if (link.state !== 'ok') {
    return (
      <AuthCard title="This link cannot be used" footer={<Link href="/profile">Go to your profile</Link>}>
        <Notice tone="warn">{link.message}</Notice>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Confirm your new e-mail address">
      <p className="mb-4 text-stone-700">
        Change the address of your Tallyvat account from <strong>{link.oldEmail}</strong> to{' '}
        <strong>{link.newEmail}</strong>?
      </p>
      <ConfirmEmailButton token={token} newEmail={link.newEmail} />
    </AuthCard>
  );
}
