import Link from 'next/link';
import type { ReactNode } from 'react';
import { Logo } from '@/components/ui/logo';
import { can, type Actor } from '@/lib/auth';
import { CoopSwitcher } from './coop-switcher';
import { NAV_ITEMS } from './nav-items';
import { SignOutButton } from './sign-out-button';
import { NavLink } from './nav-link';

/** Header (logo, co-op switcher, account), role-filtered navigation and the content area. */
export function AppShell({ actor, coops, children }: { actor: Actor; coops: { slug: string; name: string }[]; children: ReactNode }) {
  const base = `/c/${actor.coop.slug}`;
  const items = NAV_ITEMS.filter((i) => can(actor.role, i.action));
  return (
    <div className="min-h-screen">
      <a href="#content" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:p-2">
        Skip to content
      </a>
      <header className="bg-fir-800 text-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-2 px-4 py-2">
          <Link href={base} className="text-white no-underline"><Logo className="text-lg" /></Link>
          <CoopSwitcher current={actor.coop.slug} coops={coops} />
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="hidden rounded bg-fir-700 px-2 py-0.5 text-xs uppercase tracking-wide sm:inline">{actor.role}</span>
            <Link href="/profile" className="text-white">{actor.user.name}</Link>
            <SignOutButton className="rounded px-2 py-1 text-white underline-offset-2 hover:underline" />
          </div>
        </div>
        <nav aria-label="Co-op" className="bg-fir-900">
          <ul className="mx-auto flex max-w-6xl gap-1 overflow-x-auto px-2">
            {items.map((i) => (
              <li key={i.label}>
                <NavLink href={`${base}${i.href}`} exact={i.href === ''}>{i.label}</NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </header>
      <main id="content" className="mx-auto max-w-6xl px-4 py-6">{children}</main>
    </div>
  );
}
