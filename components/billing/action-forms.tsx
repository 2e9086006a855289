'use client';

import { useRouter } from 'next/navigation';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { callApi, formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import type { MemberOption } from './payment-forms';
import { SubmitButton } from '@/components/forms/submit-button';

/** Voids an issued invoice by a credit note; asks for the reason. */
export function VoidInvoiceForm({ coop, invoiceId, label }: { coop: string; invoiceId: number; label: string }) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const path = { coop, id: String(invoiceId) };
    const body = { reason: formObject(e.currentTarget).reason ?? '' };
    const out = await send(
      (b) => apiClient.POST('/api/coops/{coop}/billing/invoices/{id}/void', { params: { path }, body: b }),
      { schema: 'invoiceVoidSchema', body },
    );
    if (out) router.refresh();
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <p className="text-sm text-stone-700">
        Voiding issues a credit note that cancels {label}. Its draws and adjustments can then be invoiced again;
        anything paid on it becomes the member’s credit.
      </p>
      <TextField label="Reason" name="reason" required maxLength={240} errors={fields.reason} />
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <div>
        <SubmitButton variant="danger" disabled={busy}>
          {busy ? 'Voiding…' : `Void ${label}`}
        </SubmitButton>
      </div>
    </form>
  );
}

/** A charge (positive) or credit (negative) for a member's next invoice. */
export function AdjustmentForm({
  coop,
  members,
  currency,
  currentPeriod,
}: {
  coop: string;
  members: MemberOption[];
  currency: string;
  currentPeriod: string;
}) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = formObject(form);
    const body = { memberId: f.memberId, amount: f.amount ?? '', description: f.description ?? '', period: f.period };
    const out = await send(
      (b) => apiClient.POST('/api/coops/{coop}/billing/adjustments', { params: { path: { coop } }, body: b }),
      { schema: 'adjustmentCreateSchema', body },
      'Adjustment added; it goes on the member’s next invoice.',
    );
    if (out) {
      form.reset();
      router.refresh();
    }
  }
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
      <SelectField label="Member" name="memberId" id="adj-member" required errors={fields.memberId} defaultValue="">
        <option value="">Choose a member…</option>
        {members.map((m) => (
          <option key={m.id} value={m.id}>
            {m.name}
          </option>
        ))}
      </SelectField>
      <TextField
        label={`Amount (${currency})`}
        name="amount"
        id="adj-amount"
        inputMode="decimal"
        required
        errors={fields.amount}
        hint="Positive charges the member; negative (e.g. -5.00) credits them."
      />
      <TextField
        label="Description"
        name="description"
        id="adj-description"
        required
        maxLength={200}
        errors={fields.description}
        hint="Shown on the invoice."
      />
      <TextField
        label="From the invoice of"
        name="period"
        id="adj-period"
        type="month"
        defaultValue={currentPeriod}
        errors={fields.period}
      />
      {message ? (
        <div className="sm:col-span-2">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <div className="sm:col-span-2">
        <SubmitButton variant="secondary" disabled={busy}>
          {busy ? 'Adding…' : 'Add adjustment'}
        </SubmitButton>
      </div>
    </form>
  );
}

/** Closes and locks the month after the confirmation dialog; says what blocks it if refused. */
export function CloseMonthForm({ coop, period, label }: { coop: string; period: string; label: string }) {
  const router = useRouter();
  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm text-stone-700">
        After closing, nothing in {label} can change. Unpaid invoices stay payable; corrections become adjustments in an
        open month.
      </p>
      <div>
        <ConfirmDialog
          trigger={`Close ${label}…`}
          triggerVariant="primary"
          title={`Close ${label}?`}
          confirmLabel={`Close and lock ${label}`}
          busyLabel="Closing…"
          tone="primary"
          onConfirm={async () => {
            const r = await callApi(
              (b) =>
                apiClient.POST('/api/coops/{coop}/billing/periods/{period}/close', {
                  params: { path: { coop, period } },
                  body: b,
                }),
              { schema: 'periodCloseSchema', body: { confirm: true as const } },
            );
            if (r.ok) {
              router.refresh();
              return { ok: true, message: `${label} is closed: its draws, invoices and payments are locked.` };
            }
            const blockers = Array.isArray(r.body.blockers) ? (r.body.blockers as string[]) : [];
            return { ok: false, error: blockers.length ? `${r.error} ${blockers.join(' ')}` : r.error };
          }}
        >
          <p className="text-sm text-stone-700">
            Closing locks {label}’s draws, invoices and payments for good, so the figures the accountant gets stay the
            same. Unpaid invoices can still be paid; any correction becomes an adjustment in an open month.{' '}
            <strong>It can’t be undone.</strong>
          </p>
        </ConfirmDialog>
      </div>
    </div>
  );
}
