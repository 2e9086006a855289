'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useSWRConfig } from 'swr';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { useApiForm } from '@/components/forms/use-api-form';
import { tanksKey } from './live-tanks';

/** Reverses a draw with a reason: a new negative entry; the draw itself is never edited. */
export function ReverseDrawButton({ coopSlug, drawId }: { coopSlug: string; drawId: number }) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const [open, setOpen] = useState(false);
  const { busy, fields, message, submit } = useApiForm();
  const name = `reverse-${drawId}-reason`;
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const reason = String(new FormData(e.currentTarget).get(name) ?? '');
    const ok = await submit(`/api/coops/${coopSlug}/draws/${drawId}/reverse`, 'POST', { reason });
    if (ok) {
      setOpen(false);
      await mutate(tanksKey(coopSlug));
      router.refresh();
    }
  }
  if (!open) {
    return (
      <button type="button" className="min-h-11 rounded-lg border border-stone-300 bg-white px-3 text-sm font-semibold text-stone-900 hover:bg-stone-100" onClick={() => setOpen(true)} aria-label={`Reverse draw ${drawId}`}>
        Reverse…
      </button>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex min-w-56 flex-col gap-2" aria-label={`Reverse draw ${drawId}`}>
      <TextField label="Reason for reversing" name={name} required errors={fields.reason} />
      {message?.tone === 'danger' && !fields.reason ? <p role="alert" className="text-sm text-danger-700">{message.text}</p> : null}
      <div className="flex gap-2">
        <Button type="submit" variant="danger" disabled={busy}>{busy ? 'Reversing…' : 'Reverse draw'}</Button>
        <Button type="button" variant="ghost" onClick={() => setOpen(false)}>Keep</Button>
      </div>
    </form>
  );
}
