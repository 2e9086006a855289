import Link from 'next/link';
import type { ReactNode } from 'react';
import { StatusBadge } from './badges';
import { dateText } from './format';

/** The batch page's heading: back link, number, status, date and (once released) the certificate download. */
export function BatchHeader({
  batch: { number, status, batchDate, id, quality },
  base,
  children,
}: {
  batch: { number: number; status: string; batchDate: string; id: number; quality: { verdict: { kind: string } } };
  base: string;
  children?: ReactNode;
}) {
  const meets = quality.verdict.kind === 'meets';
  return (
    <div className="flex flex-col gap-2">
      <Link href={`${base}/batches`} className="text-sm">
        ← All batches
      </Link>
      <div className="flex flex-wrap items-center gap-3">
        <h1>Batch {number}</h1>
        <StatusBadge status={status} />
        <span className="text-sm text-stone-600">{dateText(batchDate)}</span>
        {status === 'released' ? (
          <a
            className="ml-auto inline-flex min-h-11 items-center rounded-lg border border-stone-300 bg-white px-4 py-2 text-sm font-semibold text-stone-900 no-underline hover:bg-stone-100"
            href={`/api/coops/${base.slice(3)}/batches/${id}/certificate`}
          >
            {meets ? 'Download certificate (PDF)' : 'Download batch quality record (PDF)'}
          </a>
        ) : null}
      </div>
      {children}
    </div>
  );
}
