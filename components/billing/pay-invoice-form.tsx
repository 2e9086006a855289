'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { SelectField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { callApi } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { formatCents } from '@/lib/money/format';
import { TEST_CARDS } from '@/lib/payments/test-cards';
import { SubmitButton } from '@/components/forms/submit-button';

/**
 * Pay by card. In this development build the member picks one of the payment fake's test
 * cards; no card number is ever typed into Tallyvat. The button stays disabled while a payment
 * is on its way, and the server charges at most once however often it is pressed.
 */
export function PayInvoiceForm({
  coop,
  invoiceId,
  amountCents,
  currency,
}: {
  coop: string;
  invoiceId: number;
  amountCents: number;
  currency: string;
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<{ tone: 'ok' | 'danger' | 'warn'; text: string } | null>(null);
  const [fieldErrors, setFieldErrors] = useState<string[] | undefined>();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (busy) return;
    setBusy(true);
    setResult(null);
    // The select offers only the test cards; the check names anything else.
    const body = { card: String(new FormData(e.currentTarget).get('card') ?? '') as (typeof TEST_CARDS)[number]['id'] };
    const path = { coop, id: String(invoiceId) };
    const r = await callApi(
      (b) => apiClient.POST('/api/coops/{coop}/invoices/{id}/pay', { params: { path }, body: b }),
      { schema: 'cardPaySchema', body },
    );
    setBusy(false);
    if (r.ok) {
      setResult({ tone: 'ok', text: 'Payment received — thank you.' });
      router.refresh();
      return;
    }
    setFieldErrors(r.fields.card);
    setResult({ tone: r.status === 503 ? 'warn' : 'danger', text: r.error });
    if (r.status === 409) router.refresh();
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <Notice title="Development build: test cards only">
        Choose a test card to see how paying works. No real card details are entered or kept here; a live installation
        asks for the card on the payment service’s own secure page.
      </Notice>
      <SelectField label="Card" name="card" defaultValue={TEST_CARDS[0].id} errors={fieldErrors}>
        {TEST_CARDS.map((c) => (
          <option key={c.id} value={c.id}>
            {c.label}
          </option>
        ))}
      </SelectField>
      {result ? <Notice tone={result.tone}>{result.text}</Notice> : null}
      <div>
        <SubmitButton disabled={busy} aria-busy={busy}>
          {busy ? 'Paying…' : `Pay ${formatCents(amountCents, currency)} by card`}
        </SubmitButton>
      </div>
    </form>
  );
}
