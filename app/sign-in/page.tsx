import type { Metadata } from 'next';
import Link from 'next/link';
import { Logo } from '@/components/ui/logo';
import { SignInForm } from '@/components/auth/sign-in-form';
import { safeNextPath } from '@/lib/security/redirect';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  // Only paths on the app's own origin are followed after sign-in.
  const target = safeNextPath(next);
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-4 py-10">
      <Link href="/" className="mb-6 text-fir-800 no-underline">
        <Logo className="text-2xl" />
      </Link>
      <div className="rounded-xl border border-stone-200 bg-white p-6 shadow-sm">
        <h1 className="mb-4">Sign in</h1>
        <SignInForm next={target} />
        <p className="mt-4 text-sm">
          <Link href="/reset-password">Forgot your password?</Link>
        </p>
      </div>
    </main>
  );
}
