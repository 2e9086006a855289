'use client';

import { useRouter } from 'next/navigation';
import { useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { formatVolume, volumeLabel, type UnitSystem } from '@/lib/units';
import { STATUS_LABELS, STEP_ORDER, verdictTone } from './format';
import { saveAllUnsaved } from './unsaved';

/** What the release dialog needs: the tanks, the quality state and the expected volume. */
export interface ReleaseChoice {
  tanks: { id: number; name: string; capacityLiters: number; onHandLiters: number }[];
  units: UnitSystem;
  /** The one verdict wording, e.g. "Screened — 3 of 19 required properties tested, none failing". */
  verdictText: string;
  verdictKind: 'meets' | 'fails' | 'screened';
  screeningText: string;
  /** Expected fuel, L (picks the default tank: an active tank with room for it). */
  expectedLiters: number;
}

/** The default tank: the first with room for the expected fuel, else the one with most room. */
function defaultTank(c: ReleaseChoice): number | undefined {
  const room = (t: ReleaseChoice['tanks'][number]) => t.capacityLiters - t.onHandLiters;
  const fits = c.tanks.find((t) => room(t) >= c.expectedLiters);
  return (fits ?? [...c.tanks].sort((a, b) => room(b) - room(a))[0])?.id;
}

/**
 * Moves a batch to its next step (saving any typed values first), or rejects it with a reason;
 * in Testing it offers Release and Reject, release confirmed in a dialog.
 */
export function BatchActions({ url, status, number, release }: { url: string; status: string; number?: number; release?: ReleaseChoice }) {
  const router = useRouter();
  const advance = useApiForm();
  const reject = useApiForm();
  const rel = useApiForm();
  const dialog = useRef<HTMLDialogElement>(null);
  const [rejecting, setRejecting] = useState(false);
  const idx = STEP_ORDER.indexOf(status as (typeof STEP_ORDER)[number]);
  const later = idx >= 0 ? STEP_ORDER.slice(idx + 1) : [];
  const [to, setTo] = useState<string>(later[0] ?? '');

  async function onAdvance(e: React.FormEvent) {
    e.preventDefault();
    // Nothing typed is lost: unsaved step values are saved before the batch moves on.
    if (!(await saveAllUnsaved())) {
      advance.setMessage({ tone: 'danger', text: 'Some values you typed could not be saved: fix them (see the messages beside the fields), then move on.' });
      return;
    }
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
  async function openRelease() {
    if (!(await saveAllUnsaved())) {
      advance.setMessage({ tone: 'danger', text: 'Some values you typed could not be saved: fix them before releasing.' });
      return;
    }
    dialog.current?.showModal();
  }
  async function onRelease(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const d = new FormData(e.currentTarget);
    const body = { tankId: String(d.get('tankId') ?? ''), volume: String(d.get('volume') ?? ''), reason: String(d.get('reason') ?? '').trim() || undefined };
    if (await rel.submit(`${url}/release`, 'POST', body)) {
      dialog.current?.close();
      router.refresh();
    }
  }

  const needsReason = release ? release.verdictKind !== 'meets' : false;
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
        {status === 'testing' && release ? (
          <Button type="button" onClick={openRelease} disabled={!release.tanks.length}>Release to a tank…</Button>
        ) : null}
        <Button type="button" variant="secondary" onClick={() => setRejecting((r) => !r)} aria-expanded={rejecting}>
          {rejecting ? 'Keep the batch' : 'Reject batch…'}
        </Button>
      </div>
      {status === 'testing' && release && !release.tanks.length ? <Notice tone="warn">There is no active tank to release into. Add a tank first.</Notice> : null}
      {rejecting ? (
        <form onSubmit={onReject} noValidate className="flex flex-col gap-2 rounded-lg border border-danger-600/30 bg-danger-50 p-3">
          {reject.message ? <Notice tone={reject.message.tone}>{reject.message.text}</Notice> : null}
          <TextField label="Why is the batch rejected?" name="reason" errors={reject.fields.reason} hint="Kept on the batch record. Chemicals already mixed are written off from stock." />
          <div><Button type="submit" variant="danger" disabled={reject.busy}>{reject.busy ? 'Rejecting…' : 'Reject this batch'}</Button></div>
        </form>
      ) : null}
      {release ? (
        <dialog ref={dialog} aria-labelledby="release-title" className="w-[min(36rem,calc(100vw-2rem))] rounded-xl border border-stone-300 p-0 shadow-xl backdrop:bg-stone-900/50">
          <form onSubmit={onRelease} noValidate className="flex flex-col gap-3 p-4">
            <h2 id="release-title" className="text-lg font-bold text-fir-900">Release batch{number ? ` ${number}` : ''} to a tank</h2>
            {rel.message?.tone === 'danger' ? <Notice tone="danger">{rel.message.text}</Notice> : null}
            <div className="flex flex-col gap-1 text-sm">
              <p><span className="font-semibold">Quality:</span> <span className={`inline-block rounded-full border px-2 py-0.5 text-xs font-semibold ${verdictTone(release.verdictKind)}`}>{release.verdictText}</span></p>
              <p><span className="font-semibold">Home quick tests:</span> {release.screeningText}</p>
            </div>
            <SelectField label="Into tank" name="tankId" defaultValue={String(defaultTank(release) ?? '')} errors={rel.fields.tankId}>
              {release.tanks.map((t) => (
                <option key={t.id} value={t.id}>{t.name} — room for {formatVolume(Math.max(0, t.capacityLiters - t.onHandLiters), release.units, 0)}</option>
              ))}
            </SelectField>
            <TextField label={`Volume released (${volumeLabel(release.units)})`} name="volume" inputMode="decimal" errors={rel.fields.volume} hint="Measured into the tank after drying." autoComplete="off" />
            {needsReason ? (
              <TextField
                label="Why release it now?"
                name="reason"
                errors={rel.fields.reason}
                hint={`The batch does not meet the standard in full (${release.verdictText}). The reason is kept on the batch record.`}
                autoComplete="off"
              />
            ) : null}
            <p className="text-sm text-stone-700">Releasing takes the chemicals from stock, works out the cost per {release.units === 'us' ? 'gallon' : 'litre'} and adds the fuel to the tank. <strong>It can’t be undone.</strong></p>
            <div className="flex flex-wrap gap-2">
              <Button type="submit" disabled={rel.busy}>{rel.busy ? 'Releasing…' : 'Release — can’t be undone'}</Button>
              <Button type="button" variant="secondary" onClick={() => dialog.current?.close()}>Cancel</Button>
            </div>
          </form>
        </dialog>
      ) : null}
    </div>
  );
}
