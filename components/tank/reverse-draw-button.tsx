'use client';

import { useRouter } from 'next/navigation';
import { useSWRConfig } from 'swr';
import { callApi } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { TextField } from '@/components/ui/field';
import { tanksKey } from './live-tanks';

/** Reverses a draw with a reason: a new negative entry; the draw itself is never edited. */
export function ReverseDrawButton({
  coopSlug,
  drawId,
  summary,
}: {
  coopSlug: string;
  drawId: number;
  summary?: string;
}) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  return (
    <ConfirmDialog
      trigger="Reverse…"
      triggerLabel={`Reverse draw ${drawId}`}
      title={`Reverse draw #${drawId}?`}
      confirmLabel="Reverse draw"
      busyLabel="Reversing…"
      dismissLabel="Keep the draw"
      onConfirm={async (d) => {
        const path = { coop: coopSlug, drawId: String(drawId) };
        const body = { reason: String(d.get('reason') ?? '') };
        const r = await callApi(
          (b) => apiClient.POST('/api/coops/{coop}/draws/{drawId}/reverse', { params: { path }, body: b }),
          { schema: 'drawReverseSchema', body },
        );
        if (!r.ok) return { ok: false, error: r.error, fields: r.fields };
        await mutate(tanksKey(coopSlug));
        router.refresh();
        return {
          ok: true,
          message: `Draw #${drawId} is reversed: the fuel is back in the tank and the amount comes off the member’s next invoice.`,
        };
      }}
    >
      {(fields, id) => (
        <>
          <p className="text-sm text-stone-700">
            {summary ? <>{summary}. </> : null}A reversing entry puts the fuel back in the tank and takes the amount off
            the member’s bill. The draw stays on record; it can be reversed only once.
          </p>
          <TextField
            label="Reason for reversing"
            name="reason"
            id={id('reason')}
            required
            errors={fields.reason}
            autoComplete="off"
          />
        </>
      )}
    </ConfirmDialog>
  );
}
