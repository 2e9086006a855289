'use client';

import { useRouter } from 'next/navigation';
import { useSWRConfig } from 'swr';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { apiClient, apiError } from '@/lib/api/client';
import { tanksKey } from './live-tanks';

/** Cancels an open reservation after the confirmation dialog; the result is announced. */
export function CancelReservationButton({
  coopSlug,
  reservationId,
  label,
  quantity,
}: {
  coopSlug: string;
  reservationId: number;
  label: string;
  quantity?: string;
}) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  return (
    <ConfirmDialog
      trigger="Cancel"
      triggerLabel={`Cancel ${label}`}
      triggerClassName="text-danger-700"
      title={`Cancel ${label}?`}
      confirmLabel="Yes, cancel it"
      busyLabel="Cancelling…"
      dismissLabel="Keep it"
      onConfirm={async () => {
        const r = await apiClient.POST('/api/coops/{coop}/reservations/{reservationId}/cancel', {
          params: { path: { coop: coopSlug, reservationId: String(reservationId) } },
        });
        if (r.error) return { ok: false, error: apiError(r.error, r.response.status).error };
        await mutate(tanksKey(coopSlug));
        router.refresh();
        return { ok: true, message: `Cancelled ${label}${quantity ? `: ${quantity} is back for everyone` : ''}.` };
      }}
    >
      <p className="text-sm text-stone-700">
        {quantity ? (
          <>The {quantity} held for you goes back to everyone. </>
        ) : (
          <>The fuel held for you goes back to everyone. </>
        )}
        To get fuel later, reserve again.
      </p>
    </ConfirmDialog>
  );
}
