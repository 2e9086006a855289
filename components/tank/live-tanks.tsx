'use client';

import useSWR from 'swr';
import type { UnitSystem } from '@/lib/units';
import { Notice, EmptyState } from '@/components/ui/notice';
import { jsonFetcher } from './form-utils';
import { TankGauge, type GaugeTank } from './tank-gauge';

export interface TanksResponse { tanks: GaugeTank[]; units: UnitSystem }

/** The SWR key for a co-op's tanks; forms that change a tank revalidate it with mutate(key). */
export const tanksKey = (coopSlug: string) => `/api/coops/${coopSlug}/tanks`;

/** Refresh interval for the live tank figures (members watch "available" while deciding). */
export const TANKS_REFRESH_MS = 4000;

/** Every tank's gauge, refreshed every few seconds; seeded with the server's figures. */
export function LiveTanks({ coopSlug, initial, currency, timeZone, showInactive = true }: { coopSlug: string; initial: TanksResponse; currency: string; timeZone: string; showInactive?: boolean }) {
  const { data, error } = useSWR<TanksResponse>(tanksKey(coopSlug), jsonFetcher, { fallbackData: initial, refreshInterval: TANKS_REFRESH_MS, revalidateOnMount: false });
  const tanks = (data ?? initial).tanks.filter((t) => showInactive || t.active);
  return (
    <div className="flex flex-col gap-3">
      {error ? <Notice tone="warn">The figures could not be refreshed just now; they are the last ones received. Retrying automatically.</Notice> : null}
      {tanks.length === 0 ? (
        <EmptyState title="No tanks yet">A brewer or admin adds the co-op’s tanks; fuel then arrives with released batches.</EmptyState>
      ) : (
        <div className="grid gap-3 md:grid-cols-2">
          {tanks.map((t) => <TankGauge key={t.id} tank={t} units={(data ?? initial).units} currency={currency} timeZone={timeZone} />)}
        </div>
      )}
    </div>
  );
}
