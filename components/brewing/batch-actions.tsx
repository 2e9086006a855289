'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { STATUS_LABELS, STEP_ORDER } from './format';

/** Moves a batch to its next step (or a later one), or rejects it with a reason. */
export function BatchActions({ url, status }: { url: string; status: string }) {
  const router = useRouter();
  const advance = useApiForm();
  const reject = useApiForm();
  const [rejecting, setRejecting] = useState(false);
  const idx = STEP_ORDER.indexOf(status as (typeof STEP_ORDER)[number]);
  const later = idx >= 0 ? STEP_ORDER.slice(idx + 1) : [];
  const [to, setTo] = useState<string>(later[0] ?? '');

  async function onAdvance(e: React.FormEvent) {
    e.preventDefault();
    if (await advance.submit(`${url}/advance`, 'POST', { to })) router.refresh();
  }
  async function onReject(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const reason = String(new FormData(e.currentTarget).get('reason') ?? '');
    if (await reject.submit(`${url}/reject`, 'POST', { reason })) {
      setRejecting(false);
      router.refresh();
    }
  }

  return (
    <div className="flex flex-col gap-3">
      {advance.message?.tone === 'danger' ? <Notice tone="danger">{advance.message.text}</Notice> : null}
      <div className="flex flex-wrap items-end gap-3">
        {later.length ? (
          <form onSubmit={onAdvance} className="flex flex-wrap items-end gap-2">
            <SelectField label="Next step" name="to" value={to} onChange={(e) => setTo(e.target.value)} errors={advance.fields.to}>
              {later.map((s) => <option key={s} value={s}>{STATUS_LABELS[s]}</option>)}
            </SelectField>
            <Button type="submit" disabled={advance.busy}>{advance.busy ? 'Moving…' : `Move to ${STATUS_LABELS[to]?.toLowerCase() ?? 'next step'}`}</Button>
          </form>
        ) : null}
        <Button type="button" variant="secondary" onClick={() => setRejecting((r) => !r)} aria-expanded={rejecting}>
          {rejecting ? 'Keep the batch' : 'Reject batch…'}
        </Button>
      </div>
      {rejecting ? (
        <form onSubmit={onReject} noValidate className="flex flex-col gap-2 rounded-lg border border-danger-600/30 bg-danger-50 p-3">
          {reject.message ? <Notice tone={reject.message.tone}>{reject.message.text}</Notice> : null}
          <TextField label="Why is the batch rejected?" name="reason" errors={reject.fields.reason} hint="Kept on the batch record. Chemicals already mixed are written off from stock." />
          <div><Button type="submit" variant="danger" disabled={reject.busy}>{reject.busy ? 'Rejecting…' : 'Reject this batch'}</Button></div>
        </form>
      ) : null}
    </div>
  );
}
