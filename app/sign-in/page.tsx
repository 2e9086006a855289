import type { Metadata } from 'next';
import Link from 'next/link';
import { Logo } from '@/components/ui/logo';
import { SignInForm } from '@/components/auth/sign-in-form';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  // Only same-site paths are followed after sign-in.
  const target = next && next.startsWith('/') && !next.startsWith('//') ? next : '/coops';
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-4 py-10">
      <Link href="/" className="mb-6 text-fir-800 no-underline"><Logo className="text-2xl" /></Link>
      <div className="rounded-xl border border-stone-200 bg-white p-6 shadow-sm">
        <h1 className="mb-4">Sign in</h1>
        <SignInForm next={target} />
        <p className="mt-4 text-sm"><Link href="/reset-password">Forgot your password?</Link></p>
      </div>
    </main>
  );
}
