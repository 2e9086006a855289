import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';
import { ResetPasswordForm } from '@/components/auth/password-reset-forms';
import { Notice } from '@/components/ui/notice';
import { lookupPasswordReset } from '@/lib/account';

export const metadata: Metadata = { title: 'Choose a new password', referrer: 'no-referrer' };
export const dynamic = 'force-dynamic';

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await lookupPasswordReset(token);
  if (link.state !== 'ok') {
    return (
      <AuthCard title="This link cannot be used" footer={<Link href="/sign-in">Back to sign in</Link>}>
        <Notice tone="warn">{link.message}</Notice>
        <p className="mt-4">
          <Link href="/reset-password">Ask for a new link</Link>
        </p>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Choose a new password">
      <ResetPasswordForm token={token} email={link.email} />
    </AuthCard>
  );
}
