import Link from 'next/link';
import type { ReactNode } from 'react';
import { Logo } from '@/components/ui/logo';

/** The narrow, centred card of the sign-in page, shared by the invitation and password pages. */
export function AuthCard({ title, children, footer }: { title: string; children: ReactNode; footer?: ReactNode }) {
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-4 py-10">
      <Link href="/" className="mb-6 text-fir-800 no-underline">
        <Logo className="text-2xl" />
      </Link>
      <div className="rounded-xl border border-stone-200 bg-white p-6 shadow-sm">
        <h1 className="mb-4">{title}</h1>
        {children}
      </div>
      {footer ? <div className="mt-4 text-sm">{footer}</div> : null}
    </main>
  );
}
