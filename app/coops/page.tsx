import type { Metadata } from 'next';
import Link from 'next/link';
import { redirect } from 'next/navigation';
import { Logo } from '@/components/ui/logo';
import { EmptyState } from '@/components/ui/notice';
import { getSessionUser, listMyCoops } from '@/lib/auth';
import { CreateCoopForm } from '@/components/coops/create-coop-form';
import { SignOutButton } from '@/components/shell/sign-out-button';

export const metadata: Metadata = { title: 'My co-ops' };
export const dynamic = 'force-dynamic';

export default async function MyCoopsPage() {
  const user = await getSessionUser();
  if (!user) redirect('/sign-in?next=/coops');
  const coops = await listMyCoops(user.id);
  return (
    <div className="min-h-screen">
      <header className="bg-fir-800 text-white">
        <div className="mx-auto flex max-w-4xl items-center justify-between px-4 py-3">
          <Link href="/" className="text-white no-underline">
            <Logo className="text-lg" />
          </Link>
          <div className="flex items-center gap-3 text-sm">
            <Link className="text-white" href="/profile">
              {user.name}
            </Link>
            <SignOutButton className="text-white underline-offset-2 hover:underline" />
          </div>
        </div>
      </header>
      <main className="mx-auto flex max-w-4xl flex-col gap-8 px-4 py-8">
        <section>
          <h1>My co-ops</h1>
          {coops.length === 0 ? (
            <div className="mt-4">
              <EmptyState title="You are not a member of any co-op yet">
                Ask your co-op’s admin for an invitation (it arrives by e-mail), or start a new co-op below.
              </EmptyState>
            </div>
          ) : (
            <ul className="mt-4 grid gap-3 sm:grid-cols-2">
              {coops.map((c) => (
                <li key={c.slug} className="rounded-xl border border-stone-200 bg-white p-4 shadow-sm">
                  {c.status === 'active' ? (
                    <Link href={`/c/${c.slug}`} className="text-lg font-semibold">
                      {c.name}
                    </Link>
                  ) : (
                    <span className="text-lg font-semibold text-stone-600">{c.name}</span>
                  )}
                  <p className="text-sm text-stone-600">
                    {c.role}
                    {c.status === 'suspended' ? ' · suspended' : ''}
                  </p>
                </li>
              ))}
            </ul>
          )}
        </section>
        <section className="rounded-xl border border-stone-200 bg-white p-5 shadow-sm">
          <h2>Start a new co-op</h2>
          <p className="mb-4 text-sm text-stone-600">You become its admin and can invite members.</p>
          <CreateCoopForm />
        </section>
      </main>
    </div>
  );
}
