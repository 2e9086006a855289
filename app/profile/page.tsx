import type { Metadata } from 'next';
import Link from 'next/link';
import { redirect } from 'next/navigation';
import { EmailForm, NameForm, PasswordForm, SignOutEverywhere } from '@/components/account/profile-forms';
import { SignOutButton } from '@/components/shell/sign-out-button';
import { Logo } from '@/components/ui/logo';
import { Card, EmptyState } from '@/components/ui/notice';
import { getProfile } from '@/lib/account';
import { getSessionUser } from '@/lib/auth';
import { formatDate } from '@/lib/dates';

export const metadata: Metadata = { title: 'My profile' };
export const dynamic = 'force-dynamic';

export default async function ProfilePage() {
  const user = await getSessionUser();
  if (!user) redirect('/sign-in?next=/profile');
  const profile = await getProfile(user);
  return (
    <div className="min-h-screen">
      <header className="bg-fir-800 text-white">
        <div className="mx-auto flex max-w-4xl items-center justify-between px-4 py-3">
          <Link href="/coops" className="text-white no-underline">
            <Logo className="text-lg" />
          </Link>
          <div className="flex items-center gap-3 text-sm">
            <Link className="text-white" href="/coops">
              My co-ops
            </Link>
            <SignOutButton className="text-white underline-offset-2 hover:underline" />
          </div>
        </div>
      </header>
      <main className="mx-auto flex max-w-4xl flex-col gap-6 px-4 py-8">
        <div>
          <h1>My profile</h1>
          <p className="text-stone-600">
            {profile.name} · {profile.email}
          </p>
        </div>
        <Card title="My co-ops">
          {profile.coops.length === 0 ? (
            <EmptyState title="You are not a member of any co-op yet">
              Invitations arrive by e-mail from a co-op’s admin. <Link href="/coops">Start a new co-op</Link>.
            </EmptyState>
          ) : (
            <ul className="divide-y divide-stone-100">
              {profile.coops.map((c) => (
                <li key={c.slug} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2">
                  {c.status === 'active' ? (
                    <Link href={`/c/${c.slug}`} className="font-semibold">
                      {c.name}
                    </Link>
                  ) : (
                    <span className="font-semibold text-stone-700">{c.name}</span>
                  )}
                  <span className="text-sm text-stone-600">
                    {c.role}
                    {c.status === 'suspended' ? ' · suspended' : ''} · joined {formatDate(c.joinedAt, c.timezone)}
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Card>
        <div className="grid gap-6 md:grid-cols-2">
          <Card title="Name">
            <NameForm name={profile.name} />
          </Card>
          <Card title="E-mail address">
            <EmailForm
              email={profile.email}
              pendingEmail={profile.pendingEmail}
              delivery={profile.pendingEmailDelivery}
            />
          </Card>
          <Card title="Password">
            <PasswordForm email={profile.email} />
          </Card>
          <Card title="Sessions">
            <p className="mb-3 text-sm text-stone-700">
              Signed in on a shared or lost device? End every session of yours, on every device, this one included.
            </p>
            <SignOutEverywhere />
          </Card>
        </div>
      </main>
    </div>
  );
}
