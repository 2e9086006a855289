'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useSWRConfig } from 'swr';
import { apiClient, apiError } from '@/lib/api/client';
import { tanksKey } from './live-tanks';

/** Cancels an open reservation after a confirmation step (no browser dialog; works on phones). */
export function CancelReservationButton({ coopSlug, reservationId, label }: { coopSlug: string; reservationId: number; label: string }) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const [stage, setStage] = useState<'idle' | 'confirm' | 'busy'>('idle');
  const [error, setError] = useState<string | null>(null);
  async function cancel() {
    setStage('busy');
    const r = await apiClient.POST('/api/coops/{coop}/reservations/{reservationId}/cancel', { params: { path: { coop: coopSlug, reservationId: String(reservationId) } } });
    if (r.error) {
      setError(apiError(r.error, r.response.status).error);
      setStage('idle');
      return;
    }
    await mutate(tanksKey(coopSlug));
    router.refresh();
  }
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      {stage === 'idle' ? (
        <button type="button" className="min-h-11 rounded-lg border border-stone-300 bg-white px-3 text-sm font-semibold text-danger-700 hover:bg-danger-50" onClick={() => setStage('confirm')} aria-label={`Cancel ${label}`}>
          Cancel
        </button>
      ) : (
        <>
          <button type="button" disabled={stage === 'busy'} className="min-h-11 rounded-lg bg-danger-600 px-3 text-sm font-semibold text-white hover:bg-danger-700" onClick={cancel}>
            {stage === 'busy' ? 'Cancelling…' : 'Yes, cancel it'}
          </button>
          <button type="button" className="min-h-11 rounded-lg px-3 text-sm font-semibold text-fir-700 hover:bg-fir-50" onClick={() => setStage('idle')}>Keep it</button>
        </>
      )}
      {error ? <span role="alert" className="text-sm text-danger-700">{error}</span> : null}
    </span>
  );
}
