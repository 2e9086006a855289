import { notFound, redirect } from 'next/navigation';
import { AppShell } from '@/components/shell/app-shell';
import { EmptyState } from '@/components/ui/notice';
import { listMyCoops, pageMember } from '@/lib/auth';
import { HttpError } from '@/lib/http';

export const dynamic = 'force-dynamic';

export default async function CoopLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ coop: string }>;
}) {
  const { coop } = await params;
  const actor = await pageMember(coop);
  if (actor instanceof HttpError) {
    if (actor.status === 401) redirect(`/sign-in?next=${encodeURIComponent(`/c/${coop}`)}`);
    if (actor.status === 404) notFound();
    return (
      <main className="mx-auto max-w-lg px-4 py-16">
        <EmptyState title="Your membership in this co-op is suspended">
          Ask the co-op’s admin to reinstate you. <a href="/coops">See your other co-ops</a>.
        </EmptyState>
      </main>
    );
  }
  const coops = (await listMyCoops(actor.user.id)).filter((c) => c.status === 'active');
  return (
    <AppShell actor={actor} coops={coops}>
      {children}
    </AppShell>
  );
}
