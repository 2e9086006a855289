'use client';

import Link from 'next/link';
import { useParams } from 'next/navigation';
import { EmptyState } from '@/components/ui/notice';

/** The one page a member sees where their role may not go (status 403), inside the co-op's navigation. */
export default function Forbidden() {
  const { coop } = useParams<{ coop: string }>();
  return (
    <div className="mx-auto flex max-w-lg flex-col gap-4 py-10">
      <h1>Not part of your role</h1>
      <EmptyState title="This page belongs to another role in the co-op">
        Billing is for the treasurer and admins, supplies and batches in progress for the brewers, members and settings
        for the admins. If you need it, ask the co-op’s admin.
      </EmptyState>
      <ul className="flex flex-wrap justify-center gap-3 text-sm">
        <li>
          <Link href={`/c/${coop}`}>Overview</Link>
        </li>
        <li>
          <Link href={`/c/${coop}/me`}>My fuel</Link>
        </li>
        <li>
          <Link href={`/c/${coop}/invoices`}>My invoices</Link>
        </li>
      </ul>
    </div>
  );
}
