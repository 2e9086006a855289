'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { FormResult } from '@/components/forms/form-result';
import { useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { useAnnounce } from '@/components/shell/announcer';
import { memberPriceCentsPerGallon, type PricingPolicy } from '@/lib/pricing';
import { formatRate } from '@/lib/tank/pricing-policy/convert';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { prefixedErrors, prefixedObject } from './form-utils';
import { SubmitButton } from '@/components/forms/submit-button';

type Kind = PricingPolicy['kind'];
const USES = [
  { use: 'road', label: 'Road vehicle' },
  { use: 'off-road', label: 'Off-road' },
  { use: 'heating', label: 'Heating' },
] as const;

const num = (s: string) => (s.trim() === '' ? 0 : Number(s.trim()));
const centsText = (c: number | undefined) => (c ? String(Number(c.toFixed(3))) : '');

/**
 * Sets a new pricing policy; earlier ones stay as history and recorded draws keep their price.
 * Starts from the policy in force (so changing only the margin keeps the surcharge and road
 * tax), previews the member price for each declared use at a tank's average cost, and warns
 * before a surcharge or road tax in force is dropped.
 */
export function PricingForm({
  coopSlug,
  units,
  currency,
  current,
  costCentsPerUnit,
  costTank,
}: {
  coopSlug: string;
  units: UnitSystem;
  currency: string;
  /** The policy in force, in the co-op's units. */
  current?: PricingPolicy;
  /** Average cost per co-op unit of the tank the preview uses, and its name. */
  costCentsPerUnit?: number | null;
  costTank?: string;
}) {
  const router = useRouter();
  const announce = useAnnounce();
  const { busy, fields, message, send } = useApiForm();
  const [kind, setKind] = useState<Kind>(current?.kind ?? 'cost-plus-amount');
  const [v, setV] = useState({
    price: current?.kind === 'fixed' ? (current.priceCents / 100).toFixed(2) : '',
    margin: current?.kind === 'cost-plus-amount' ? (current.marginCents / 100).toFixed(2) : '',
    marginPct: current?.kind === 'cost-plus-percent' ? String(current.marginPct) : '',
    surchargeCents: centsText(current?.surchargeCentsPerGallon),
    roadTaxCents: centsText(current?.roadTaxCentsPerGallon),
  });
  const per = volumeLabel(units);
  const errors = prefixedErrors(fields, 'price');
  const set = (k: keyof typeof v) => (e: React.ChangeEvent<HTMLInputElement>) =>
    setV((o) => ({ ...o, [k]: e.target.value }));

  const policy: PricingPolicy | null = (() => {
    const extras = { surchargeCentsPerGallon: num(v.surchargeCents), roadTaxCentsPerGallon: num(v.roadTaxCents) };
    const p: PricingPolicy =
      kind === 'fixed'
        ? { kind, priceCents: Math.round(num(v.price) * 100), ...extras }
        : kind === 'cost-plus-amount'
          ? { kind, marginCents: Math.round(num(v.margin) * 100), ...extras }
          : { kind, marginPct: num(v.marginPct), ...extras };
    return Object.values(extras).every(Number.isFinite) && (kind !== 'fixed' || num(v.price) > 0) ? p : null;
  })();
  const preview = USES.map(({ use, label }) => {
    try {
      if (!policy || (kind !== 'fixed' && (costCentsPerUnit === null || costCentsPerUnit === undefined)))
        return { label, text: null };
      return {
        label,
        text: `${formatRate(memberPriceCentsPerGallon(policy, costCentsPerUnit ?? null, use).totalCents, currency)}/${per}`,
      };
    } catch {
      return { label, text: null };
    }
  });
  const dropped = [
    current?.surchargeCentsPerGallon && !num(v.surchargeCents) ? 'the reserve surcharge' : null,
    current?.roadTaxCentsPerGallon && !num(v.roadTaxCents) ? 'the road-fuel tax' : null,
  ].filter(Boolean);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = prefixedObject(e.currentTarget, 'price');
    const body = {
      kind,
      price: f.price,
      margin: f.margin,
      marginPct: f.marginPct,
      surchargeCents: f.surchargeCents,
      roadTaxCents: f.roadTaxCents,
      effectiveFrom: f.effectiveFrom,
    };
    const ok = await send(
      (b) => apiClient.POST('/api/coops/{coop}/pricing', { params: { path: { coop: coopSlug } }, body: b }),
      { schema: 'pricingPolicyCreateSchema', body },
    );
    if (ok) {
      announce({ tone: 'ok', text: 'New price saved. It applies to draws recorded from now on.' });
      router.refresh();
    }
  }
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Set the member price" className="grid gap-4 sm:grid-cols-2">
      {current ? (
        <p className="text-sm text-stone-700 sm:col-span-2">
          The form starts from the price in force: change only what should change.
        </p>
      ) : null}
      <SelectField
        label="How the price is set"
        name="price-kind"
        value={kind}
        onChange={(e) => setKind(e.target.value as Kind)}
        errors={errors['price-kind']}
      >
        <option value="cost-plus-amount">Cost + amount per {per}</option>
        <option value="cost-plus-percent">Cost + percentage</option>
        <option value="fixed">Fixed price per {per}</option>
      </SelectField>
      {kind === 'fixed' ? (
        <TextField
          label={`Price (${currency} per ${per})`}
          name="price-price"
          value={v.price}
          onChange={set('price')}
          inputMode="decimal"
          autoComplete="off"
          required
          errors={errors['price-price']}
          hint="Whole cents, e.g. 4.25"
        />
      ) : kind === 'cost-plus-amount' ? (
        <TextField
          label={`Amount added (${currency} per ${per})`}
          name="price-margin"
          value={v.margin}
          onChange={set('margin')}
          inputMode="decimal"
          autoComplete="off"
          required
          errors={errors['price-margin']}
          hint="Added to the tank’s average cost; whole cents, e.g. 0.40"
        />
      ) : (
        <TextField
          label="Percentage added (%)"
          name="price-marginPct"
          value={v.marginPct}
          onChange={set('marginPct')}
          inputMode="decimal"
          autoComplete="off"
          required
          errors={errors['price-marginPct']}
          hint="e.g. 15 for cost × 1.15"
        />
      )}
      <TextField
        label={`Reserve surcharge (cents per ${per}, optional)`}
        name="price-surchargeCents"
        value={v.surchargeCents}
        onChange={set('surchargeCents')}
        inputMode="decimal"
        autoComplete="off"
        errors={errors['price-surchargeCents']}
        hint="Added to every draw, e.g. 10 for a reserve or equipment fund."
      />
      <TextField
        label={`Road-fuel tax (cents per ${per}, optional)`}
        name="price-roadTaxCents"
        value={v.roadTaxCents}
        onChange={set('roadTaxCents')}
        inputMode="decimal"
        autoComplete="off"
        errors={errors['price-roadTaxCents']}
        hint="Charged on road use only; fractions of a cent allowed, e.g. 24.4."
      />
      <TextField
        label="Takes effect (optional)"
        name="price-effectiveFrom"
        type="datetime-local"
        errors={errors['price-effectiveFrom']}
        hint="Leave empty for now; a later time schedules the change."
      />
      <section
        aria-labelledby="price-preview"
        className="rounded-lg border border-stone-200 bg-stone-50 p-3 sm:col-span-2"
      >
        <h3 id="price-preview" className="text-sm font-semibold text-fir-900">
          Members would pay
        </h3>
        {kind !== 'fixed' && (costCentsPerUnit === null || costCentsPerUnit === undefined) ? (
          <p className="text-sm text-stone-700">
            No tank has fuel with a known cost yet, so a cost-based price can’t be previewed.
          </p>
        ) : (
          <>
            <dl className="mt-1 grid grid-cols-3 gap-2 text-sm" aria-live="polite">
              {preview.map((p) => (
                <div key={p.label}>
                  <dt className="text-xs text-stone-600">{p.label}</dt>
                  <dd className="font-semibold tabular-nums">{p.text ?? '—'}</dd>
                </div>
              ))}
            </dl>
            {kind !== 'fixed' && costTank ? (
              <p className="mt-1 text-xs text-stone-600">
                At {costTank}’s average cost of {formatRate(costCentsPerUnit ?? 0, currency)}/{per} today.
              </p>
            ) : null}
          </>
        )}
      </section>
      {dropped.length ? (
        <div className="sm:col-span-2">
          <Notice tone="warn">
            This drops {dropped.join(' and ')} now in force. Leave the field filled in to keep it.
          </Notice>
        </div>
      ) : null}
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Save new price'}</SubmitButton>
      </div>
      <FormResult message={message?.tone === 'danger' ? message : null} className="sm:col-span-2" />
    </form>
  );
}
