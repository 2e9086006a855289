import Link from 'next/link';
import type { ReactNode } from 'react';
import { Logo } from '@/components/ui/logo';
import { can, type Actor } from '@/lib/auth';
import { CoopSwitcher } from './coop-switcher';
import { NAV_ITEMS } from './nav-items';
import { SignOutButton } from './sign-out-button';
import { NavMenu } from './nav-menu';
import { Announcer } from './announcer';

/** Header (logo, co-op switcher, account), role-filtered navigation, the content area and its Announcer. */
export function AppShell({
  actor,
  coops,
  children,
}: {
  actor: Actor;
  coops: { slug: string; name: string }[];
  children: ReactNode;
}) {
  const base = `/c/${actor.coop.slug}`;
  const items = NAV_ITEMS.filter((i) => can(actor.role, i.action));
  return (
    <div className="min-h-screen">
      <a
        href="#content"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:p-2"
      >
        Skip to content
      </a>
      <header className="bg-fir-800 text-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-2 px-4 py-2">
          <Link href={base} className="text-white no-underline">
            <Logo className="text-lg" />
          </Link>
          <CoopSwitcher current={actor.coop.slug} coops={coops} />
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="hidden rounded bg-fir-700 px-2 py-0.5 text-xs uppercase tracking-wide sm:inline">
              {actor.role}
            </span>
            <Link href="/profile" className="text-white">
              {actor.user.name}
            </Link>
            <SignOutButton className="rounded px-2 py-1 text-white underline-offset-2 hover:underline" />
          </div>
        </div>
        <NavMenu items={items.map((i) => ({ href: `${base}${i.href}`, label: i.label, exact: i.href === '' }))} />
      </header>
      <main id="content" className="mx-auto max-w-6xl px-4 py-6 pb-24">
        <Announcer>{children}</Announcer>
      </main>
    </div>
  );
}
