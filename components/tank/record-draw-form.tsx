'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useSWRConfig } from 'swr';
import { SelectField, TextField } from '@/components/ui/field';
import { useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import type { DeclaredUse } from '@/lib/pricing';
import { FormResult } from '@/components/forms/form-result';
import { formatCents } from '@/lib/money';
import { formatMl, unitWord } from '@/lib/tank/volume';
import type { UnitSystem } from '@/lib/units';
import { prefixedErrors, prefixedObject } from './form-utils';
import { tanksKey } from './live-tanks';
import { SubmitButton } from '@/components/forms/submit-button';

export interface OpenReservationOption {
  id: number;
  membershipId: number;
  memberName: string;
  tankId: number;
  tankName: string;
  quantityLiters: number;
}

/**
 * Records a draw from the pump meter (before/after) or a plain quantity, against a member's open
 * reservation or as a walk-up. In self-serve mode the member is fixed to the signed-in member.
 */
export function RecordDrawForm({
  coopSlug,
  units,
  currency,
  tanks,
  members,
  reservations,
  selfServe,
  lastMeter = {},
}: {
  coopSlug: string;
  units: UnitSystem;
  currency: string;
  tanks: { id: number; name: string }[];
  members: { membershipId: number; name: string }[];
  reservations: OpenReservationOption[];
  selfServe?: boolean;
  /** The pump meter's last reading per tank id, in the co-op's units: "meter before" starts there. */
  lastMeter?: Record<number, number>;
}) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const { busy, fields, message, send, setMessage } = useApiForm();
  const [memberId, setMemberId] = useState<string>(selfServe ? String(members[0]?.membershipId ?? '') : '');
  const [reservationId, setReservationId] = useState<string>('');
  const [tankId, setTankId] = useState<string>(String(tanks[0]?.id ?? ''));
  const [mode, setMode] = useState<'meter' | 'quantity'>('meter');
  const errors = prefixedErrors(fields, 'draw');
  const memberReservations = reservations.filter((r) => String(r.membershipId) === memberId);
  const last = lastMeter[Number(tankId)];

  function chooseReservation(id: string) {
    setReservationId(id);
    const r = reservations.find((x) => String(x.id) === id);
    if (r) setTankId(String(r.tankId));
  }

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const b = prefixedObject(form, 'draw');
    // The select offers the declared uses; the server names a missing or bad one.
    const body = {
      membershipId: selfServe ? undefined : b.membershipId,
      tankId: b.tankId,
      reservationId: b.reservationId,
      quantity: b.quantity,
      meterBefore: b.meterBefore,
      meterAfter: b.meterAfter,
      declaredUse: b.declaredUse as DeclaredUse,
      vehicle: b.vehicle,
      occurredAt: b.occurredAt,
    };
    const r = await send(
      (d) => apiClient.POST('/api/coops/{coop}/draws', { params: { path: { coop: coopSlug } }, body: d }),
      { schema: 'drawCreateSchema', body },
    );
    if (r) {
      setMessage({
        tone: 'ok',
        text: `Recorded draw #${r.id}: ${formatMl(Math.round(r.quantityLiters * 1000), units, { digits: 2 })} for ${r.memberName}, ${formatCents(r.totalCents, currency)} at the price in force.`,
      });
      form.reset();
      setReservationId('');
      if (!selfServe) setMemberId('');
      await mutate(tanksKey(coopSlug));
      router.refresh();
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Record a draw" className="grid gap-4 sm:grid-cols-2">
      {selfServe ? (
        <input type="hidden" name="draw-membershipId" value={memberId} />
      ) : (
        <SelectField
          label="Member"
          name="draw-membershipId"
          value={memberId}
          onChange={(e) => {
            setMemberId(e.target.value);
            setReservationId('');
          }}
          errors={errors['draw-membershipId']}
        >
          <option value="">Choose a member…</option>
          {members.map((m) => (
            <option key={m.membershipId} value={m.membershipId}>
              {m.name}
            </option>
          ))}
        </SelectField>
      )}
      <SelectField
        label="Reservation"
        name="draw-reservationId"
        value={reservationId}
        onChange={(e) => chooseReservation(e.target.value)}
        errors={errors['draw-reservationId']}
        hint={
          memberId && memberReservations.length === 0
            ? 'No open reservation: this is a walk-up draw from available fuel.'
            : undefined
        }
      >
        <option value="">Walk-up (no reservation)</option>
        {memberReservations.map((r) => (
          <option key={r.id} value={r.id}>
            #{r.id} · {formatMl(Math.round(r.quantityLiters * 1000), units)} from {r.tankName}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Tank"
        name="draw-tankId"
        value={tankId}
        onChange={(e) => setTankId(e.target.value)}
        errors={errors['draw-tankId']}
      >
        {tanks.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Declared use"
        name="draw-declaredUse"
        defaultValue="road"
        errors={errors['draw-declaredUse']}
        hint="Road fuel carries the road-fuel tax; off-road and heating do not."
      >
        <option value="road">Road vehicle</option>
        <option value="off-road">Off-road (farm, machinery)</option>
        <option value="heating">Heating</option>
      </SelectField>
      <fieldset className="sm:col-span-2">
        <legend className="text-sm font-medium text-stone-800">How was it measured?</legend>
        <div className="mt-1 flex flex-wrap gap-4">
          <label className="inline-flex min-h-11 items-center gap-2">
            <input
              type="radio"
              name="draw-mode"
              value="meter"
              checked={mode === 'meter'}
              onChange={() => setMode('meter')}
            />{' '}
            Pump meter readings
          </label>
          <label className="inline-flex min-h-11 items-center gap-2">
            <input
              type="radio"
              name="draw-mode"
              value="quantity"
              checked={mode === 'quantity'}
              onChange={() => setMode('quantity')}
            />{' '}
            Quantity only
          </label>
        </div>
      </fieldset>
      {mode === 'meter' ? (
        <>
          <TextField
            key={`meter-${tankId}-${last ?? ''}`}
            label={`Meter before (${unitWord(units)})`}
            name="draw-meterBefore"
            inputMode="decimal"
            autoComplete="off"
            required
            errors={errors['draw-meterBefore']}
            defaultValue={last === undefined ? undefined : String(last)}
            hint={
              last === undefined
                ? undefined
                : 'The pump’s last recorded reading; change it if the meter shows otherwise.'
            }
          />
          <TextField
            label={`Meter after (${unitWord(units)})`}
            name="draw-meterAfter"
            inputMode="decimal"
            autoComplete="off"
            required
            errors={errors['draw-meterAfter']}
          />
          {errors['draw-quantity'] ? (
            <p role="alert" className="text-sm text-danger-700 sm:col-span-2">
              {errors['draw-quantity'].join(' ')}
            </p>
          ) : null}
        </>
      ) : (
        <TextField
          label={`Quantity drawn (${unitWord(units)})`}
          name="draw-quantity"
          inputMode="decimal"
          autoComplete="off"
          required
          errors={errors['draw-quantity']}
        />
      )}
      <TextField
        label="Vehicle or use (optional)"
        name="draw-vehicle"
        errors={errors['draw-vehicle']}
        hint="e.g. 2004 pickup, farm tractor, home furnace"
      />
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Recording…' : 'Record draw'}</SubmitButton>
      </div>
      <FormResult message={message} className="sm:col-span-2" />
    </form>
  );
}
