'use client';

import { useRouter } from 'next/navigation';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { SubmitButton } from '@/components/forms/submit-button';

/** Picks a month and starts preparing its draft invoices, then opens the month's page. */
export function RunMonthForm({
  coop,
  defaultPeriod,
  maxPeriod,
}: {
  coop: string;
  defaultPeriod: string;
  maxPeriod: string;
}) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const { period } = formObject(e.currentTarget);
    const out = await send(
      (b) => apiClient.POST('/api/coops/{coop}/billing/runs', { params: { path: { coop } }, body: b }),
      { schema: 'billingRunCreateSchema', body: { period: period ?? '' } },
    );
    if (out) router.push(`/c/${coop}/billing/${out.run.period}`);
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3 sm:flex-row sm:items-end">
      <div className="sm:w-56">
        <TextField
          type="month"
          label="Month to invoice"
          name="period"
          defaultValue={defaultPeriod}
          max={maxPeriod}
          required
          errors={fields.period}
        />
      </div>
      <SubmitButton disabled={busy}>{busy ? 'Starting…' : 'Prepare draft invoices'}</SubmitButton>
      {message ? (
        <div className="sm:ml-2">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
    </form>
  );
}
