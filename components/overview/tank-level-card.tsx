'use client';

import useSWR from 'swr';
import { formatVolume, type UnitSystem } from '@/lib/units';
import type { TankSummary } from '@/lib/overview/types';
import { apiClient, dataOrThrow } from '@/lib/api/client';

/**
 * On hand / reserved / available across the co-op's tanks, refreshed every few seconds (SWR),
 * seeded from the server. The bar shows proportions; the numbers are always written out.
 */
export function TankLevelCard({ coop, units, initial }: { coop: string; units: UnitSystem; initial: TankSummary }) {
  const { data, error } = useSWR(
    `/api/coops/${coop}/overview`,
    () => dataOrThrow(apiClient.GET('/api/coops/{coop}/overview', { params: { path: { coop } } })),
    { refreshInterval: 10_000 },
  );
  const t = data?.tank ?? initial;
  const cap = Number(t.capacityLiters) || 1;
  const pct = (l: string) => `${Math.min(100, Math.max(0, (Number(l) / cap) * 100)).toFixed(1)}%`;
  const v = (l: string) => formatVolume(Number(l), units, 0);
  // Fuel held while a batch in a tank is under review (a recall): on hand, not for reserving or drawing.
  const held = Number(t.heldLiters) > 0 ? formatVolume(Number(t.heldLiters), units, 0) : null;
  return (
    <section className="rounded-xl border border-stone-200 bg-white p-4 shadow-sm" aria-labelledby="tank-level-h">
      <h2 id="tank-level-h" className="text-base">
        Fuel in the tank{t.tanks > 1 ? `s (${t.tanks})` : ''}
      </h2>
      {t.tanks === 0 ? (
        <p className="mt-2 text-sm text-stone-600">No tank set up yet. A brewer or admin adds one on the Tank page.</p>
      ) : (
        <>
          <p className="mt-1 text-3xl font-bold text-fir-800 tabular-nums">
            {v(t.availableLiters)} <span className="text-base font-medium text-stone-600">available</span>
          </p>
          <div className="mt-3 flex h-4 w-full overflow-hidden rounded-full bg-stone-200" aria-hidden="true">
            <div className="bg-fir-600" style={{ width: pct(t.availableLiters) }} />
            <div className="bg-amber-500" style={{ width: pct(t.reservedLiters) }} />
          </div>
          <dl className="mt-3 grid grid-cols-3 gap-2 text-sm">
            <div>
              <dt className="text-stone-600">On hand</dt>
              <dd className="font-semibold tabular-nums">{v(t.onHandLiters)}</dd>
            </div>
            <div>
              <dt className="flex items-center gap-1 text-stone-600">
                <span className="inline-block h-2.5 w-2.5 rounded-sm bg-amber-500" aria-hidden="true" />
                Reserved
              </dt>
              <dd className="font-semibold tabular-nums">{v(t.reservedLiters)}</dd>
            </div>
            <div>
              <dt className="text-stone-600">Capacity</dt>
              <dd className="font-semibold tabular-nums">{v(t.capacityLiters)}</dd>
            </div>
          </dl>
          {held ? (
            <p className="mt-2 text-sm font-semibold text-danger-700">
              {held} held: a batch is under review, so this fuel cannot be reserved or drawn.
            </p>
          ) : null}
          {error ? (
            <p role="status" className="mt-2 text-xs text-warn-700">
              Could not refresh just now; showing the last figures.
            </p>
          ) : null}
          <p className="sr-only" aria-live="polite">
            {v(t.availableLiters)} available{held ? `; ${held} held` : ''}
          </p>
        </>
      )}
    </section>
  );
}
