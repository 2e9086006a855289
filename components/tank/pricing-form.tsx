'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { prefixedErrors, prefixedObject } from './form-utils';

/** Sets a new pricing policy; earlier ones stay as history and recorded draws keep their price. */
export function PricingForm({ coopSlug, units, currency }: { coopSlug: string; units: UnitSystem; currency: string }) {
  const router = useRouter();
  const { busy, fields, message, submit } = useApiForm();
  const [kind, setKind] = useState<'fixed' | 'cost-plus-amount' | 'cost-plus-percent'>('cost-plus-amount');
  const per = volumeLabel(units);
  const errors = prefixedErrors(fields, 'price');
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const ok = await submit(`/api/coops/${coopSlug}/pricing`, 'POST', prefixedObject(form, 'price'), 'New price saved. It applies to draws recorded from now on.');
    if (ok) {
      form.reset();
      router.refresh();
    }
  }
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Set the member price" className="grid gap-4 sm:grid-cols-2">
      {message ? <div className="sm:col-span-2"><Notice tone={message.tone}>{message.text}</Notice></div> : null}
      <SelectField label="How the price is set" name="price-kind" value={kind} onChange={(e) => setKind(e.target.value as typeof kind)} errors={errors['price-kind']}>
        <option value="cost-plus-amount">Cost + amount per {per}</option>
        <option value="cost-plus-percent">Cost + percentage</option>
        <option value="fixed">Fixed price per {per}</option>
      </SelectField>
      {kind === 'fixed' ? (
        <TextField label={`Price (${currency} per ${per})`} name="price-price" inputMode="decimal" autoComplete="off" required errors={errors['price-price']} hint="Whole cents, e.g. 4.25" />
      ) : kind === 'cost-plus-amount' ? (
        <TextField label={`Amount added (${currency} per ${per})`} name="price-margin" inputMode="decimal" autoComplete="off" required errors={errors['price-margin']} hint="Added to the tank’s average cost; whole cents, e.g. 0.40" />
      ) : (
        <TextField label="Percentage added (%)" name="price-marginPct" inputMode="decimal" autoComplete="off" required errors={errors['price-marginPct']} hint="e.g. 15 for cost × 1.15" />
      )}
      <TextField label={`Reserve surcharge (cents per ${per}, optional)`} name="price-surchargeCents" inputMode="decimal" autoComplete="off" errors={errors['price-surchargeCents']} hint="Added to every draw, e.g. 10 for a reserve or equipment fund." />
      <TextField label={`Road-fuel tax (cents per ${per}, optional)`} name="price-roadTaxCents" inputMode="decimal" autoComplete="off" errors={errors['price-roadTaxCents']} hint="Charged on road use only; fractions of a cent allowed, e.g. 24.4." />
      <TextField label="Takes effect (optional)" name="price-effectiveFrom" type="datetime-local" errors={errors['price-effectiveFrom']} hint="Leave empty for now; a later time schedules the change." />
      <div className="sm:col-span-2"><Button type="submit" disabled={busy}>{busy ? 'Saving…' : 'Save new price'}</Button></div>
    </form>
  );
}
