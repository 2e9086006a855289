import { dateText } from '@/components/brewing/format';
import { Notice } from '@/components/ui/notice';
import type { RecallNotice } from '@/lib/lineage';
import { RECALL_CAUTIONS, RECALL_DEFERENCE } from '@/lib/safety';
import { formatVolume, volumeToLiters, type UnitSystem } from '@/lib/units';

const OUTCOME = {
  cleared: 'cleared — the fuel is fit to use again',
  retreated: 're-treated — the rest of it was taken back for re-processing',
  disposed: 'disposed of',
} as const;

/** On a member's overview: batches under review (or recently reviewed) that they drew some of. */
export function RecallNotices({ notices, units }: { notices: RecallNotice[]; units: UnitSystem }) {
  if (notices.length === 0) return null;
  return (
    <section aria-label="Fuel under review" className="flex flex-col gap-3">
      {notices.map((n) => (
        <Notice
          key={n.batchId}
          tone={n.status === 'open' ? 'danger' : 'info'}
          title={
            n.status === 'open'
              ? `Fuel you drew from batch ${n.batchNumber} is under review`
              : `Review of batch ${n.batchNumber} closed`
          }
        >
          <p>
            You received about {formatVolume(volumeToLiters(n.quantity, units), units, 2)} of batch {n.batchNumber}.
            What was found: {n.finding}
          </p>
          {n.status === 'open' ? (
            <>
              <ul className="mt-1 list-disc pl-5">
                {RECALL_CAUTIONS.map((c) => (
                  <li key={c}>{c}</li>
                ))}
              </ul>
              <p className="mt-1">{RECALL_DEFERENCE}</p>
            </>
          ) : (
            <p className="mt-1">
              Closed {dateText(n.closedAt)}: {n.outcome ? OUTCOME[n.outcome] : ''}.
            </p>
          )}
        </Notice>
      ))}
    </section>
  );
}
