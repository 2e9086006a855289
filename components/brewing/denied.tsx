import { notFound, redirect } from 'next/navigation';
import { EmptyState } from '@/components/ui/notice';
import type { HttpError } from '@/lib/http';

/** What a page shows when findActor refused: sign-in for 401, not found for 404, a reason for 403. */
export function Denied({ error, why, next }: { error: HttpError; why: string; next: string }) {
  if (error.status === 401) redirect(`/sign-in?next=${encodeURIComponent(next)}`);
  if (error.status === 404) notFound();
  return (
    <div className="mx-auto max-w-lg py-10">
      <EmptyState title="Not available to your role">{why}</EmptyState>
    </div>
  );
}
