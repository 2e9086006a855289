import type { Metadata } from 'next';
import Link from 'next/link';
import { BatchTable } from '@/components/brewing/batch-table';
import { STATUS_LABELS } from '@/components/brewing/format';
import { EmptyState } from '@/components/ui/notice';
import { can, requirePageActor } from '@/lib/auth';
import { listBatches } from '@/lib/brewing';
import { SCREENING_CAUTION } from '@/lib/quality';
import { batchListSchema } from '@/lib/validation/brewing';

export const metadata: Metadata = { title: 'Batches' };

const FILTERS = ['', 'planned', 'in-progress', 'testing', 'released', 'rejected'] as const;

export default async function BatchesPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'batches:read-released', `/c/${coop}/batches`);
  const sp = await searchParams;
  const parsed = batchListSchema.safeParse(sp);
  const q = parsed.success ? parsed.data : batchListSchema.parse({});
  const all = can(actor.role, 'batches:read-all');
  const { rows, total, page, pageSize } = await listBatches(actor, q);
  const base = `/c/${actor.coop.slug}/batches`;
  const filterHref = (s: string) => {
    const p = new URLSearchParams();
    if (s) p.set('status', s);
    if (q.sort !== 'number') p.set('sort', q.sort);
    if (q.dir !== 'desc') p.set('dir', q.dir);
    const qs = p.toString();
    return qs ? `${base}?${qs}` : base;
  };
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Batches</h1>
          <p className="text-sm text-stone-600">
            {all
              ? 'Every batch from plan to tank, with its cost and quality.'
              : 'Batches released to the tank, with their quality results.'}
          </p>
        </div>
        {can(actor.role, 'batches:write') ? (
          <Link
            href={`/c/${actor.coop.slug}/planner`}
            className="inline-flex min-h-11 items-center rounded-lg bg-fir-700 px-4 py-2 text-sm font-semibold text-white no-underline hover:bg-fir-800"
          >
            Plan a batch
          </Link>
        ) : null}
      </div>
      {all ? (
        <nav aria-label="Filter by status">
          <ul className="flex flex-wrap gap-2 text-sm">
            {FILTERS.map((s) => {
              const active = (q.status ?? '') === s;
              return (
                <li key={s || 'all'}>
                  <Link
                    href={filterHref(s)}
                    aria-current={active ? 'page' : undefined}
                    className={`inline-block rounded-full border px-3 py-1.5 no-underline ${active ? 'border-fir-700 bg-fir-700 text-white' : 'border-stone-300 bg-white text-stone-800 hover:bg-stone-100'}`}
                  >
                    {s ? STATUS_LABELS[s] : 'All'}
                  </Link>
                </li>
              );
            })}
          </ul>
        </nav>
      ) : null}
      {!parsed.success ? (
        <p className="text-sm text-warn-700">That filter or sort is not available; showing all batches.</p>
      ) : null}
      {total === 0 && !q.status ? (
        <EmptyState title={all ? 'No batches yet' : 'No released batches yet'}>
          {all ? (
            <>
              Start with the{' '}
              <Link className="underline" href={`/c/${actor.coop.slug}/planner`}>
                planner
              </Link>
              : oil volume and titration in, chemicals and cost out.
            </>
          ) : (
            'When the brewers release a batch into the tank it appears here with its quality results.'
          )}
        </EmptyState>
      ) : (
        <BatchTable
          rows={rows}
          slug={actor.coop.slug}
          units={actor.coop.units}
          currency={actor.coop.currency}
          pageInfo={{ page, pageSize, total }}
        />
      )}
      <p className="text-xs text-stone-600">{SCREENING_CAUTION}</p>
    </div>
  );
}
