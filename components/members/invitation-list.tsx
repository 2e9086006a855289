'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { callApi } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { EmptyState, Notice } from '@/components/ui/notice';
import { useRefreshWhile } from '@/components/ui/use-refresh-while';
import type { InvitationDto } from '@/lib/members/invitations';

/** A pending invitation as the page hands it to the client (expiry already worded in the co-op's zone). */
export type InvitationRow = Pick<InvitationDto, 'id' | 'email' | 'role' | 'delivery' | 'expired' | 'invitedBy'> & {
  expiresLabel: string;
  sentLabel: string | null;
};

/** Where an invitation's e-mail stands, in words (text, not colour alone, carries it). */
function DeliveryPill({ inv }: { inv: InvitationRow }) {
  if (inv.delivery === 'not-sent') {
    return (
      <p className="mt-1 inline-block rounded-full bg-warn-50 px-2 py-0.5 text-xs font-semibold text-warn-700">
        E-mail failed after every try — resend it
      </p>
    );
  }
  if (inv.delivery === 'queued')
    return (
      <p className="mt-1 inline-block rounded-full bg-stone-100 px-2 py-0.5 text-xs font-semibold text-stone-700">
        E-mail queued
      </p>
    );
  return (
    <p className="mt-1 inline-block rounded-full bg-ok-50 px-2 py-0.5 text-xs font-semibold text-ok-700">
      E-mail sent{inv.sentLabel ? ` ${inv.sentLabel}` : ''}
    </p>
  );
}

/** Pending invitations with their e-mail's delivery, resend (a new link) and revoke. */
export function InvitationList({ coopSlug, invitations }: { coopSlug: string; invitations: InvitationRow[] }) {
  const router = useRouter();
  const [busyId, setBusyId] = useState<number | null>(null);
  const [confirming, setConfirming] = useState<number | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'warn' | 'danger'; text: string } | null>(null);
  // While an e-mail is queued, the list is read again every 2 s, so it shows sent or failed as it happens.
  useRefreshWhile(invitations.some((i) => i.delivery === 'queued'));

  async function resend(inv: InvitationRow) {
    setBusyId(inv.id);
    setMessage(null);
    const r = await callApi(() =>
      apiClient.POST('/api/coops/{coop}/invitations/{id}/resend', {
        params: { path: { coop: coopSlug, id: String(inv.id) } },
      }),
    );
    setBusyId(null);
    if (!r.ok) return setMessage({ tone: 'danger', text: r.error });
    setMessage({ tone: 'ok', text: `Sending again to ${inv.email} with a new link; the old link no longer works.` });
    router.refresh();
  }

  async function revoke(inv: InvitationRow) {
    setBusyId(inv.id);
    setMessage(null);
    const r = await callApi(() =>
      apiClient.DELETE('/api/coops/{coop}/invitations/{id}', {
        params: { path: { coop: coopSlug, id: String(inv.id) } },
      }),
    );
    setBusyId(null);
    setConfirming(null);
    if (!r.ok) return setMessage({ tone: 'danger', text: r.error });
    setMessage({ tone: 'ok', text: `The invitation to ${inv.email} was withdrawn.` });
    router.refresh();
  }

  return (
    <div className="flex flex-col gap-3">
      <div aria-live="polite">{message ? <Notice tone={message.tone}>{message.text}</Notice> : null}</div>
      {invitations.length === 0 ? (
        <EmptyState title="No invitations waiting">
          Invitations you send appear here until they are accepted.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-stone-100">
          {invitations.map((inv) => (
            <li key={inv.id} className="flex flex-col gap-2 py-3 sm:flex-row sm:items-center sm:justify-between">
              <div className="min-w-0">
                <p className="break-all font-medium text-stone-900">{inv.email}</p>
                <p className="text-sm text-stone-600">
                  {inv.role}
                  {inv.invitedBy ? ` · invited by ${inv.invitedBy}` : ''} ·{' '}
                  {inv.expired ? (
                    <span className="font-semibold text-warn-700">link expired {inv.expiresLabel}</span>
                  ) : (
                    `link works until ${inv.expiresLabel}`
                  )}
                </p>
                <DeliveryPill inv={inv} />
              </div>
              <div className="flex shrink-0 flex-wrap gap-2">
                {confirming === inv.id ? (
                  <>
                    <button
                      type="button"
                      className="min-h-10 rounded-md bg-danger-600 px-3 text-xs font-semibold text-white hover:bg-danger-700"
                      disabled={busyId === inv.id}
                      onClick={() => revoke(inv)}
                    >
                      Yes, revoke
                    </button>
                    <button
                      type="button"
                      className="min-h-10 rounded-md border border-stone-300 px-3 text-xs font-semibold"
                      onClick={() => setConfirming(null)}
                    >
                      Cancel
                    </button>
                  </>
                ) : (
                  <>
                    <button
                      type="button"
                      className="min-h-10 rounded-md border border-stone-300 bg-white px-3 text-xs font-semibold text-stone-900 hover:bg-stone-100"
                      disabled={busyId === inv.id}
                      onClick={() => resend(inv)}
                    >
                      Resend<span className="sr-only"> to {inv.email}</span>
                    </button>
                    <button
                      type="button"
                      className="min-h-10 rounded-md px-3 text-xs font-semibold text-danger-700 hover:bg-danger-50"
                      disabled={busyId === inv.id}
                      onClick={() => setConfirming(inv.id)}
                    >
                      Revoke<span className="sr-only"> invitation to {inv.email}</span>
                    </button>
                  </>
                )}
              </div>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
