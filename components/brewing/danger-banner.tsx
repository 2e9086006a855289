'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { formatTemp, type UnitSystem } from '@/lib/units';

/** A Danger temperature reading no brewer has acknowledged yet (lib/brewing DangerAlert). */
export interface DangerBannerAlert {
  batchId: number;
  number: number;
  maxTempC: number;
  lastAt: string;
}

/**
 * A banner per batch with an unacknowledged Danger reading (at or above methanol's boiling
 * point), on the batch and on the overview, until a brewer acknowledges it.
 */
export function DangerBanner({
  alerts,
  slug,
  units,
  canAcknowledge,
  linkToBatch = true,
}: {
  alerts: DangerBannerAlert[];
  slug: string;
  units: UnitSystem;
  canAcknowledge: boolean;
  linkToBatch?: boolean;
}) {
  const router = useRouter();
  const { busy, message, send } = useApiForm();
  if (!alerts.length) return null;
  return (
    <div className="flex flex-col gap-2">
      {alerts.map((a) => (
        <div
          key={a.batchId}
          role="alert"
          className="flex flex-wrap items-center gap-3 rounded-lg border border-danger-600 bg-danger-50 p-3 text-sm text-danger-700"
        >
          <p className="min-w-0 flex-1">
            <strong>Danger:</strong>{' '}
            {linkToBatch ? (
              <Link href={`/c/${slug}/batches/${a.batchId}`} className="font-semibold underline">
                Batch {a.number}
              </Link>
            ) : (
              `Batch ${a.number}`
            )}{' '}
            reached {formatTemp(a.maxTempC, units, 1)}, at or above methanol’s boiling point. Check the heater and
            ventilation; methanol vapour is flammable and toxic.
          </p>
          {canAcknowledge ? (
            <Button
              type="button"
              variant="danger"
              disabled={busy}
              onClick={async () => {
                if (
                  await send(() =>
                    apiClient.POST('/api/coops/{coop}/batches/{id}/temperatures/acknowledge', {
                      params: { path: { coop: slug, id: String(a.batchId) } },
                    }),
                  )
                )
                  router.refresh();
              }}
            >
              {busy ? 'Saving…' : 'Acknowledge'}
            </Button>
          ) : null}
        </div>
      ))}
      {message?.tone === 'danger' ? <p className="text-sm text-danger-700">{message.text}</p> : null}
    </div>
  );
}
