'use client';

import { useEffect, useRef, useState } from 'react';
import { useRouter } from 'next/navigation';
import useSWR from 'swr';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { callApi, type ClientCall } from '@/components/forms/use-api-form';
import { apiClient, dataOrThrow } from '@/lib/api/client';
import { formatCents } from '@/lib/money/format';
import type { PeriodOverview } from '@/lib/billing/months';

/**
 * The month's live state, polled while something is moving (a run building drafts, e-mails
 * going out): progress, counts, and the next step — prepare, issue, resend.
 */
export function PeriodProgress({
  coop,
  period,
  initial,
  currency,
}: {
  coop: string;
  period: string;
  initial: PeriodOverview;
  currency: string;
}) {
  const router = useRouter();
  const url = `/api/coops/${coop}/billing/periods/${period}`;
  const { data, error, mutate } = useSWR(
    url,
    () =>
      dataOrThrow(apiClient.GET('/api/coops/{coop}/billing/periods/{period}', { params: { path: { coop, period } } })),
    { fallbackData: initial },
  );
  const [busy, setBusy] = useState<string | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);
  const moving = Boolean(data && (data.run?.status === 'running' || data.email.queued + data.email.sending > 0));
  const wasMoving = useRef(moving);
  // A server refresh (after closing, voiding, recording…) re-renders this widget with newer
  // figures: take them, then check again. (Not on mount: SWR fetches by itself then.)
  const mounted = useRef(false);
  useEffect(() => {
    if (!mounted.current) {
      mounted.current = true;
      return;
    }
    void mutate(initial, { revalidate: true });
  }, [initial, mutate]);
  // Poll once a second while something is moving (an explicit timer: it keeps going whatever the
  // first answer was, and stops with the movement).
  useEffect(() => {
    if (!moving) return;
    const timer = setInterval(() => void mutate(), 1000);
    return () => clearInterval(timer);
  }, [moving, mutate]);
  useEffect(() => {
    if (wasMoving.current && !moving) router.refresh();
    wasMoving.current = moving;
  }, [moving, router]);

  if (!data) return <Notice tone="danger">Could not load this month. Reload the page.</Notice>;
  const run = data.run;
  const money = (c: number) => formatCents(c, currency);

  /** `ok` null: the live state above says what happened (a run's progress follows the run, not the click). */
  async function act<T>(name: string, call: () => ClientCall<T>, ok: ((d: T) => string) | null) {
    setBusy(name);
    setMessage(null);
    const r = await callApi(call);
    setBusy(null);
    if (r.ok) setMessage(ok ? { tone: 'ok', text: ok(r.data) } : null);
    else setMessage({ tone: 'danger', text: r.error });
    await mutate();
    router.refresh();
  }

  const pct = run && run.totalMembers > 0 ? Math.round((run.doneMembers / run.totalMembers) * 100) : 100;
  const unsent = data.email.failed + data.email.notSent;
  return (
    <section aria-labelledby="progress-h" className="rounded-xl border border-stone-200 bg-white p-4 shadow-sm">
      <h2 id="progress-h">This month’s invoices</h2>
      {error ? (
        <p className="text-sm text-danger-700">
          Live updates paused (connection problem); the figures may be out of date.
        </p>
      ) : null}
      <div aria-live="polite" className="mt-2 flex flex-col gap-3">
        {run?.status === 'running' ? (
          <div>
            <label htmlFor="run-progress" className="text-sm font-medium">
              Preparing drafts: {run.doneMembers} of {run.totalMembers} members
            </label>
            <progress
              id="run-progress"
              className="mt-1 block h-3 w-full accent-fir-700"
              value={run.doneMembers}
              max={Math.max(run.totalMembers, 1)}
            >
              {pct}%
            </progress>
          </div>
        ) : run?.status === 'failed' ? (
          <Notice tone="danger" title="The last run stopped">
            {run.error} Members already prepared are kept; start it again to finish.
          </Notice>
        ) : run?.status === 'completed' ? (
          <p className="text-sm text-stone-700">
            Last run finished: {run.totalMembers} member{run.totalMembers === 1 ? '' : 's'} looked at
            {run.limitedToMembers ? ` (limited to ${run.limitedToMembers})` : ''}.
          </p>
        ) : (
          <p className="text-sm text-stone-700">No invoices have been prepared for this month yet.</p>
        )}

        <dl className="grid grid-cols-2 gap-x-4 gap-y-2 text-sm sm:grid-cols-4">
          <div>
            <dt className="text-stone-600">Drafts</dt>
            <dd className="text-lg font-semibold">
              {data.counts.draft}
              {data.counts.draft ? (
                <span className="block text-xs font-normal text-stone-600">{money(data.totals.draftCents)}</span>
              ) : null}
            </dd>
          </div>
          <div>
            <dt className="text-stone-600">Unpaid</dt>
            <dd className="text-lg font-semibold">{data.counts.issued + data.counts.partlyPaid}</dd>
          </div>
          <div>
            <dt className="text-stone-600">Paid</dt>
            <dd className="text-lg font-semibold">{data.counts.paid}</dd>
          </div>
          <div>
            <dt className="text-stone-600">Outstanding</dt>
            <dd className="text-lg font-semibold">{money(data.totals.outstandingCents)}</dd>
          </div>
        </dl>
        {data.email.queued + data.email.sending > 0 ? (
          <p className="text-sm">
            E-mailing invoices… {data.email.sent} sent, {data.email.queued + data.email.sending} to go.
          </p>
        ) : data.email.sent + unsent > 0 ? (
          <p className="text-sm text-stone-700">
            E-mails: {data.email.sent} sent
            {unsent ? (
              <>
                , <strong className="text-danger-700">{unsent} not delivered</strong>
              </>
            ) : null}
            .
          </p>
        ) : null}

        {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
        {data.closed ? (
          <Notice title="This month is closed">
            Its invoices and payments are locked. Corrections go into an open month as adjustments.
          </Notice>
        ) : (
          <div className="flex flex-wrap gap-2">
            <Button
              variant={data.counts.draft ? 'secondary' : 'primary'}
              disabled={busy !== null || run?.status === 'running'}
              onClick={() =>
                act(
                  'run',
                  () =>
                    apiClient.POST('/api/coops/{coop}/billing/runs', { params: { path: { coop } }, body: { period } }),
                  null,
                )
              }
            >
              {busy === 'run'
                ? 'Starting…'
                : data.counts.draft || data.counts.issued + data.counts.paid
                  ? 'Prepare drafts again'
                  : 'Prepare draft invoices'}
            </Button>
            {data.counts.draft > 0 ? (
              <Button
                disabled={busy !== null || run?.status === 'running'}
                onClick={() =>
                  act(
                    'issue',
                    () =>
                      apiClient.POST('/api/coops/{coop}/billing/periods/{period}/issue', {
                        params: { path: { coop, period } },
                        body: {},
                      }),
                    (d) =>
                      `Issued ${d.issued} invoice(s), ${d.firstNumber} to ${d.lastNumber}. E-mails are on their way.`,
                  )
                }
              >
                {busy === 'issue'
                  ? 'Issuing…'
                  : `Issue ${data.counts.draft} invoice${data.counts.draft === 1 ? '' : 's'} and e-mail them`}
              </Button>
            ) : null}
            {unsent > 0 ? (
              <Button
                variant="secondary"
                disabled={busy !== null}
                onClick={() =>
                  act(
                    'send',
                    () =>
                      apiClient.POST('/api/coops/{coop}/billing/periods/{period}/send', {
                        params: { path: { coop, period } },
                        body: {},
                      }),
                    (d) => `${d.queued} e-mail(s) queued again.`,
                  )
                }
              >
                {busy === 'send' ? 'Queuing…' : 'Send the unsent e-mails'}
              </Button>
            ) : null}
          </div>
        )}
      </div>
    </section>
  );
}
