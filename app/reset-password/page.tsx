import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';
import { ResetRequestForm } from '@/components/auth/password-reset-forms';

export const metadata: Metadata = { title: 'Reset your password' };

export default function ResetPasswordRequestPage() {
  return (
    <AuthCard title="Reset your password" footer={<Link href="/sign-in">Back to sign in</Link>}>
      <ResetRequestForm />
    </AuthCard>
  );
}
