'use client';

import { Notice, EmptyState } from '@/components/ui/notice';
import { TankGauge } from './tank-gauge';
import { useTanks, type TanksResponse } from './use-tanks';

export { tanksKey, TANKS_REFRESH_MS, type TanksResponse } from './use-tanks';

/** Every tank's gauge, refreshed every few seconds; seeded with the server's figures. */
export function LiveTanks({
  coopSlug,
  initial,
  currency,
  timeZone,
  showInactive = true,
}: {
  coopSlug: string;
  initial: TanksResponse;
  currency: string;
  timeZone: string;
  showInactive?: boolean;
}) {
  const { data, error } = useTanks(coopSlug, initial);
  const tanks = (data ?? initial).tanks.filter((t) => showInactive || t.active);
  return (
    <div className="flex flex-col gap-3">
      {error ? (
        <Notice tone="warn">
          The figures could not be refreshed just now; they are the last ones received. Retrying automatically.
        </Notice>
      ) : null}
      {tanks.length === 0 ? (
        <EmptyState title="No tanks yet">
          A brewer or admin adds the co-op’s tanks; fuel then arrives with released batches.
        </EmptyState>
      ) : (
        <div className="grid gap-3 md:grid-cols-2">
          {tanks.map((t) => (
            <TankGauge key={t.id} tank={t} units={(data ?? initial).units} currency={currency} timeZone={timeZone} />
          ))}
        </div>
      )}
    </div>
  );
}
