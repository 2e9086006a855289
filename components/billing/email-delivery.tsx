'use client';

import { useEffect } from 'react';
import useSWR from 'swr';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { EmailStatusText } from '@/components/billing/status-badge';
import { apiClient, dataOrThrow } from '@/lib/api/client';
import { formatDate } from '@/lib/dates';
import type { EmailStatus } from '@/lib/billing/types';

export interface EmailDeliveryState {
  emailStatus: EmailStatus;
  emailedAt: string | null;
  emailAttempts: number;
}

/** Still on its way: the mail job has not settled yet. */
const moving = (s: string) => s === 'queued' || s === 'sending';

/**
 * An issued invoice's e-mail: where it stands (queued → sending → sent, or not delivered after
 * every try), followed live while the worker has it, and "E-mail it again", which queues its
 * mail job (the answer is "queued"; this line follows it from there).
 */
export function InvoiceEmailDelivery({
  coop,
  invoiceId,
  to,
  timezone,
  initial,
}: {
  coop: string;
  invoiceId: number;
  to: string;
  timezone: string;
  initial: EmailDeliveryState;
}) {
  const path = { coop, id: String(invoiceId) };
  const { data, mutate } = useSWR(
    `/api/coops/${coop}/billing/invoices/${invoiceId}#email`,
    async () => {
      const inv = await dataOrThrow(apiClient.GET('/api/coops/{coop}/billing/invoices/{id}', { params: { path } }));
      return {
        emailStatus: inv.emailStatus,
        emailedAt: inv.emailedAt,
        emailAttempts: inv.emailAttempts,
      } satisfies EmailDeliveryState;
    },
    { fallbackData: initial, revalidateOnMount: false },
  );
  const state = data ?? initial;
  const { busy, message, send } = useApiForm();
  // Poll every 1.5 s while the job has it; stop once it settles.
  useEffect(() => {
    if (!moving(state.emailStatus)) return;
    const timer = setInterval(() => void mutate(), 1500);
    return () => clearInterval(timer);
  }, [state.emailStatus, mutate]);

  return (
    <div className="flex flex-col gap-2">
      <p aria-live="polite">
        E-mail to {to}: <EmailStatusText status={state.emailStatus} />
        {state.emailedAt ? `, last sent ${formatDate(state.emailedAt, timezone)}` : ''} ({state.emailAttempts} attempt
        {state.emailAttempts === 1 ? '' : 's'}).
      </p>
      <div>
        <Button
          variant="secondary"
          disabled={busy || moving(state.emailStatus)}
          onClick={async () => {
            const out = await send(() =>
              apiClient.POST('/api/coops/{coop}/billing/invoices/{id}/send', { params: { path }, body: {} }),
            );
            if (out) await mutate({ ...state, emailStatus: out.emailStatus }, { revalidate: true });
          }}
        >
          {busy ? 'Queuing…' : 'E-mail it again'}
        </Button>
      </div>
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
    </div>
  );
}
