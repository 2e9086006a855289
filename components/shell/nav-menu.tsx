'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { useState } from 'react';

export interface NavEntry {
  href: string;
  label: string;
  exact: boolean;
}

const isActive = (path: string, e: NavEntry) =>
  e.exact ? path === e.href : path === e.href || path.startsWith(`${e.href}/`);

/**
 * The co-op navigation. From 640 px up every section shows in a wrapping row; on a phone one
 * line says where you are ("Tank") with a Menu button that opens all sections as a grid, so
 * nothing scrolls sideways out of view. Closes itself after a navigation.
 */
export function NavMenu({ items }: { items: NavEntry[] }) {
  const path = usePathname();
  // Open on the page it was opened on: a navigation closes it.
  const [openAt, setOpenAt] = useState<string | null>(null);
  const open = openAt === path;
  // The longest match wins, so /c/x/billing/2026-11 marks Billing rather than Overview.
  const current = items.filter((e) => isActive(path, e)).sort((a, b) => b.href.length - a.href.length)[0];
  return (
    <nav aria-label="Co-op" className="bg-fir-900">
      <div className="mx-auto flex max-w-6xl items-center justify-between gap-2 px-4 py-1 sm:hidden">
        <span className="truncate text-sm font-semibold text-white" data-testid="current-section">
          <span className="sr-only">Section: </span>
          {current?.label ?? 'Co-op'}
        </span>
        <button
          type="button"
          aria-expanded={open}
          aria-controls="coop-nav-list"
          onClick={() => setOpenAt(open ? null : path)}
          className="inline-flex min-h-11 items-center gap-1 rounded-md border border-fir-600 px-3 text-sm font-semibold text-white hover:bg-fir-800"
        >
          {open ? 'Close menu' : 'Menu'} <span aria-hidden="true">{open ? '▴' : '▾'}</span>
        </button>
      </div>
      <ul
        id="coop-nav-list"
        className={`mx-auto max-w-6xl gap-1 px-2 max-sm:grid max-sm:grid-cols-2 max-sm:pb-2 sm:flex sm:flex-wrap ${open ? '' : 'max-sm:hidden'}`}
      >
        {items.map((e) => {
          const active = current?.href === e.href;
          return (
            <li key={e.href}>
              <Link
                href={e.href}
                aria-current={active ? 'page' : undefined}
                className={`block whitespace-nowrap px-3 py-2.5 text-sm font-medium no-underline max-sm:rounded-md max-sm:border-l-4 sm:border-b-4 ${
                  active
                    ? 'border-amber-400 text-white max-sm:bg-fir-800'
                    : 'border-transparent text-fir-100 hover:text-white'
                }`}
              >
                {e.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
