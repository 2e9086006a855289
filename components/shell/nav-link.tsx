'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import type { ReactNode } from 'react';

export function NavLink({ href, exact, children }: { href: string; exact?: boolean; children: ReactNode }) {
  const path = usePathname();
  const active = exact ? path === href : path === href || path.startsWith(`${href}/`);
  return (
    <Link
      href={href}
      aria-current={active ? 'page' : undefined}
      className={`block whitespace-nowrap border-b-4 px-3 py-2.5 text-sm font-medium no-underline ${
        active ? 'border-amber-400 text-white' : 'border-transparent text-fir-100 hover:text-white'
      }`}
    >
      {children}
    </Link>
  );
}
