'use client';

// Payments by hand: recording cash or a cheque, matching a payment to an invoice, refunds.

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { callApi, formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { formatCents } from '@/lib/money/format';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { useAnnounce } from '@/components/shell/announcer';
import { SubmitButton } from '@/components/forms/submit-button';

export interface MemberOption {
  id: number;
  name: string;
}
export interface OpenInvoiceOption {
  id: number;
  memberId: number;
  label: string;
  outstandingCents: number;
}

/** Records cash or a cheque; the invoice is optional (without one the payment waits unmatched). */
export function RecordPaymentForm({
  coop,
  members,
  invoices,
  currency,
  today,
  fixed,
}: {
  coop: string;
  members: MemberOption[];
  invoices: OpenInvoiceOption[];
  currency: string;
  today: string;
  fixed?: { memberId: number; invoiceId: number };
}) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  const [memberId, setMemberId] = useState<number | null>(fixed?.memberId ?? null);
  const mine = invoices.filter((i) => i.memberId === memberId);
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = formObject(form);
    // The select offers cash and cheque only; the server names a bad value.
    const body = {
      memberId: f.memberId,
      method: f.method as 'cash' | 'cheque',
      amount: f.amount ?? '',
      receivedOn: f.receivedOn ?? '',
      invoiceId: f.invoiceId || undefined,
      reference: f.reference || undefined,
      note: f.note || undefined,
    };
    const out = await send(
      (b) => apiClient.POST('/api/coops/{coop}/billing/payments', { params: { path: { coop } }, body: b }),
      { schema: 'paymentRecordSchema', body },
      'Payment recorded.',
    );
    if (out) {
      form.reset();
      setMemberId(fixed?.memberId ?? null);
      router.refresh();
    }
  }
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
      {fixed ? (
        <>
          <input type="hidden" name="memberId" value={fixed.memberId} />
          <input type="hidden" name="invoiceId" value={fixed.invoiceId} />
        </>
      ) : (
        <>
          <SelectField
            label="Member"
            name="memberId"
            required
            errors={fields.memberId}
            defaultValue=""
            onChange={(e) => setMemberId(e.target.value ? Number(e.target.value) : null)}
          >
            <option value="">Choose a member…</option>
            {members.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name}
              </option>
            ))}
          </SelectField>
          <SelectField
            label="Apply to invoice"
            name="invoiceId"
            errors={fields.invoiceId}
            hint="Leave unmatched to decide later on the month’s reconciliation."
            defaultValue=""
          >
            <option value="">Not matched yet</option>
            {mine.map((i) => (
              <option key={i.id} value={i.id}>
                {i.label} — {formatCents(i.outstandingCents, currency)} due
              </option>
            ))}
          </SelectField>
        </>
      )}
      <SelectField label="Method" name="method" defaultValue="cash" errors={fields.method}>
        <option value="cash">Cash</option>
        <option value="cheque">Cheque</option>
      </SelectField>
      <TextField
        label={`Amount (${currency})`}
        name="amount"
        inputMode="decimal"
        placeholder="0.00"
        required
        errors={fields.amount}
      />
      <TextField
        label="Received on"
        name="receivedOn"
        type="date"
        max={today}
        defaultValue={today}
        required
        errors={fields.receivedOn}
      />
      <TextField
        label="Reference (optional)"
        name="reference"
        maxLength={60}
        errors={fields.reference}
        hint="Cheque number, receipt number…"
      />
      <div className="sm:col-span-2">
        <TextField label="Note (optional)" name="note" maxLength={240} errors={fields.note} />
      </div>
      {message ? (
        <div className="sm:col-span-2">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Record payment'}</SubmitButton>
      </div>
    </form>
  );
}

/** Matches an unmatched payment to one of the payer's invoices, or holds it as credit. */
export function MatchPaymentForm({
  coop,
  paymentId,
  invoices,
  currency,
}: {
  coop: string;
  paymentId: number;
  invoices: OpenInvoiceOption[];
  currency: string;
}) {
  const router = useRouter();
  const announce = useAnnounce();
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const target = formObject(e.currentTarget).target ?? '';
    const body = { invoiceId: target === 'credit' ? null : Number(target) };
    const out = await send(
      (b) =>
        apiClient.POST('/api/coops/{coop}/billing/payments/{id}/match', {
          params: { path: { coop, id: String(paymentId) } },
          body: b,
        }),
      { schema: 'paymentMatchSchema', body },
    );
    if (!out) return;
    const inv = invoices.find((i) => String(i.id) === target);
    announce({ tone: 'ok', text: inv ? `Payment matched to ${inv.label}.` : 'Payment held as the member’s credit.' });
    router.refresh();
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-2 sm:flex-row sm:items-end">
      <SelectField
        label="Match to"
        name="target"
        id={`target-${paymentId}`}
        errors={fields.invoiceId}
        defaultValue={invoices[0] ? String(invoices[0].id) : 'credit'}
      >
        {invoices.map((i) => (
          <option key={i.id} value={i.id}>
            {i.label} — {formatCents(i.outstandingCents, currency)} due
          </option>
        ))}
        <option value="credit">Hold as the member’s credit</option>
      </SelectField>
      <SubmitButton variant="secondary" disabled={busy}>
        {busy ? 'Matching…' : 'Match'}
      </SubmitButton>
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
    </form>
  );
}

/** Refunds money held for the member from one payment (card ones through the payment service), after the confirmation dialog. */
export function RefundForm({
  coop,
  paymentId,
  refundableCents,
  method,
  currency,
  payer,
}: {
  coop: string;
  paymentId: number;
  refundableCents: number;
  method: string;
  currency: string;
  payer?: string;
}) {
  const router = useRouter();
  const most = formatCents(refundableCents, currency);
  return (
    <ConfirmDialog
      trigger="Refund…"
      triggerLabel={`Refund payment ${paymentId}`}
      triggerClassName="min-h-10 px-3 text-xs"
      title={`Refund ${payer ? `${payer}’s` : 'this'} payment?`}
      confirmLabel="Refund — can’t be undone"
      busyLabel="Refunding…"
      onConfirm={async (d) => {
        const body = { amount: String(d.get('amount') ?? ''), reason: String(d.get('reason') ?? '') };
        const r = await callApi(
          (b) =>
            apiClient.POST('/api/coops/{coop}/billing/payments/{id}/refunds', {
              params: { path: { coop, id: String(paymentId) } },
              body: b,
            }),
          { schema: 'refundCreateSchema', body },
        );
        if (!r.ok) return { ok: false, error: r.error, fields: r.fields };
        router.refresh();
        return { ok: true, message: `Refund recorded${method === 'card' ? ': it goes back to the card' : ''}.` };
      }}
    >
      {(fields, id) => (
        <>
          <p className="text-sm text-stone-700">
            Up to {most} can be given back{method === 'card' ? ' to the card, through the payment service' : ' in cash'}
            . It comes out of the money not matched to an invoice, then the member’s credit. A refund can’t be taken
            back.
          </p>
          <TextField
            label="Amount to refund"
            id={id('amount')}
            name="amount"
            inputMode="decimal"
            required
            errors={fields.amount}
            autoComplete="off"
          />
          <TextField
            label="Reason"
            id={id('reason')}
            name="reason"
            required
            maxLength={240}
            errors={fields.reason}
            autoComplete="off"
          />
        </>
      )}
    </ConfirmDialog>
  );
}

/** A pending card refund that the payment service did not confirm: send it again. */
export function RetryRefundButton({ coop, refundId }: { coop: string; refundId: number }) {
  const router = useRouter();
  const { busy, message, send } = useApiForm();
  return (
    <span className="inline-flex flex-col gap-1">
      <Button
        variant="ghost"
        disabled={busy}
        onClick={async () =>
          (await send(() =>
            apiClient.POST('/api/coops/{coop}/billing/refunds/{id}/retry', {
              params: { path: { coop, id: String(refundId) } },
            }),
          )) && router.refresh()
        }
      >
        {busy ? 'Retrying…' : 'Retry refund'}
      </Button>
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
    </span>
  );
}
