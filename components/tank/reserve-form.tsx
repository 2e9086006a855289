'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useSWRConfig } from 'swr';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { FormResult } from '@/components/forms/form-result';
import { useAnnounce } from '@/components/shell/announcer';
import { formatCents } from '@/lib/money';
import { drawChargeCents, memberPriceCentsPerGallon, type PricingPolicy } from '@/lib/pricing';
import { formatMl, unitWord } from '@/lib/tank/volume';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { prefixedErrors, prefixedObject } from './form-utils';
import { tanksKey, useTanks, type TanksResponse } from './use-tanks';
import { SubmitButton } from '@/components/forms/submit-button';

/**
 * A member reserves fuel for themself. The selected tank's available quantity is shown live
 * (the same SWR data as the gauges); the server has the last word, and a 409 says how much is
 * available now.
 */
export function ReserveForm({
  coopSlug,
  initial,
  today,
  defaultEnd,
  pricing,
  currency = 'USD',
}: {
  coopSlug: string;
  initial: TanksResponse;
  today: string;
  defaultEnd: string;
  /** The price in force, in the co-op's units, for the cost estimate. */
  pricing?: PricingPolicy;
  currency?: string;
}) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const { busy, fields, message, send } = useApiForm();
  const announce = useAnnounce();
  const { data } = useTanks(coopSlug, initial);
  const units: UnitSystem = (data ?? initial).units;
  // Only tanks in service with fuel to spare are offered.
  const tanks = (data ?? initial).tanks.filter((t) => t.active && t.availableLiters > 0);
  const [qty, setQty] = useState('');
  const [tankId, setTankId] = useState<number | null>(tanks[0]?.id ?? null);
  const tank = tanks.find((t) => t.id === tankId) ?? tanks[0];
  const errors = prefixedErrors(fields, 'res');

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = prefixedObject(form, 'res');
    const body = {
      tankId: f.tankId,
      quantity: f.quantity ?? '',
      windowStart: f.windowStart ?? '',
      windowEnd: f.windowEnd ?? '',
    };
    const ok = await send(
      (b) => apiClient.POST('/api/coops/{coop}/reservations', { params: { path: { coop: coopSlug } }, body: b }),
      { schema: 'reservationCreateSchema', body },
    );
    await mutate(tanksKey(coopSlug));
    if (ok) {
      form.reset();
      setQty('');
      announce({ tone: 'ok', text: 'Reserved. Bring your container during the window; a brewer records the draw.' });
      router.refresh();
    }
  }

  const estimate = (() => {
    const q = Number(qty.trim());
    if (!pricing || !tank || qty.trim() === '' || !Number.isFinite(q) || q <= 0) return null;
    try {
      const per = (use: 'road' | 'off-road') => memberPriceCentsPerGallon(pricing, tank.avgCostCentsPerUnit, use);
      return { offRoad: drawChargeCents(q, per('off-road')), road: drawChargeCents(q, per('road')) };
    } catch {
      return null;
    }
  })();

  if (tanks.length === 0)
    return (
      <Notice tone="info">
        No tank in service has fuel to spare right now, so there is nothing to reserve. Check back after the next batch
        is released.
      </Notice>
    );
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Reserve fuel" className="grid gap-4 sm:grid-cols-2">
      <SelectField
        label="Tank"
        name="res-tankId"
        value={tank?.id ?? ''}
        onChange={(e) => setTankId(Number(e.target.value))}
        errors={errors['res-tankId']}
      >
        {tanks.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </SelectField>
      <TextField
        label={`Quantity (${unitWord(units)})`}
        name="res-quantity"
        inputMode="decimal"
        autoComplete="off"
        required
        errors={errors['res-quantity']}
        hint={
          tank ? (
            <span>
              Available now in {tank.name}:{' '}
              <strong data-testid="reserve-available">
                {formatMl(Math.round(tank.availableLiters * 1000), units, { floor: true })}
              </strong>{' '}
              (updates every few seconds)
            </span>
          ) : null
        }
        placeholder={`e.g. 10 ${volumeLabel(units)}`}
        value={qty}
        onChange={(e) => setQty(e.target.value)}
      />
      <p className="text-sm text-stone-700 sm:col-span-2" aria-live="polite" data-testid="reserve-estimate">
        {estimate ? (
          <>
            Estimated cost at today’s price: <strong>{formatCents(estimate.offRoad, currency)}</strong>
            {estimate.road !== estimate.offRoad ? (
              <> ({formatCents(estimate.road, currency)} for road use, with road-fuel tax)</>
            ) : null}
            . You pay the price in force when the fuel is drawn.
          </>
        ) : pricing ? (
          'Type a quantity to see the estimated cost.'
        ) : null}
      </p>
      <TextField
        label="From"
        name="res-windowStart"
        type="date"
        required
        defaultValue={today}
        min={today}
        errors={errors['res-windowStart']}
      />
      <TextField
        label="Until (last day)"
        name="res-windowEnd"
        type="date"
        required
        defaultValue={defaultEnd}
        min={today}
        errors={errors['res-windowEnd']}
        hint="The reservation expires after this day and the fuel goes back to everyone."
      />
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Reserving…' : 'Reserve fuel'}</SubmitButton>
      </div>
      <FormResult message={message} className="sm:col-span-2" />
    </form>
  );
}
