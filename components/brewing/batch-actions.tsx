'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ConfirmDialog, type ConfirmOutcome } from '@/components/ui/confirm-dialog';
import { useAnnounce } from '@/components/shell/announcer';
import { callApi, numberOf, useApiForm, type ApiResult } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { batchPath } from './batch-path';
import { formatVolume, volumeLabel, type UnitSystem } from '@/lib/units';
import { QualityBadge } from './badges';
import { STATUS_LABELS, STEP_ORDER } from './format';
import { saveAllUnsaved } from './unsaved';
import { SubmitButton } from '@/components/forms/submit-button';

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
 * in Testing it offers Release and Reject. Release and reject are confirmed in the one dialog.
 */
export function BatchActions({
  url,
  status,
  number,
  release,
}: {
  url: string;
  status: string;
  number?: number;
  release?: ReleaseChoice;
}) {
  const router = useRouter();
  const announce = useAnnounce();
  const advance = useApiForm();
  const idx = STEP_ORDER.indexOf(status as (typeof STEP_ORDER)[number]);
  const later = idx >= 0 ? STEP_ORDER.slice(idx + 1) : [];
  const [to, setTo] = useState<string>(later[0] ?? '');
  const name = `Batch${number ? ` ${number}` : ''}`;
  const path = batchPath(url);

  async function onAdvance(e: React.FormEvent) {
    e.preventDefault();
    // Nothing typed is lost: unsaved step values are saved before the batch moves on.
    if (!(await saveAllUnsaved())) {
      advance.setMessage({
        tone: 'danger',
        text: 'Some values you typed could not be saved: fix them (see the messages beside the fields), then move on.',
      });
      return;
    }
    // The select offers only later steps; the check names anything else.
    const body = { to: to as Exclude<(typeof STEP_ORDER)[number], 'planned'> };
    if (
      await advance.send(
        (b) => apiClient.POST('/api/coops/{coop}/batches/{id}/advance', { params: { path }, body: b }),
        { schema: 'batchAdvanceSchema', body },
      )
    ) {
      announce({ tone: 'ok', text: `${name} moved to ${STATUS_LABELS[to]?.toLowerCase() ?? 'the next step'}.` });
      router.refresh();
    }
  }
  async function saved(what: string) {
    if (await saveAllUnsaved()) return true;
    advance.setMessage({ tone: 'danger', text: `Some values you typed could not be saved: fix them before ${what}.` });
    return false;
  }
  function outcome(r: ApiResult<unknown>, ok: string): ConfirmOutcome {
    if (!r.ok) return { ok: false, error: r.error, fields: r.fields };
    router.refresh();
    return { ok: true, message: ok };
  }

  const needsReason = release ? release.verdictKind !== 'meets' : false;
  const str = (d: FormData, k: string) => String(d.get(k) ?? '');
  return (
    <div className="flex flex-col gap-3">
      {advance.message?.tone === 'danger' ? <Notice tone="danger">{advance.message.text}</Notice> : null}
      <div className="flex flex-wrap items-end gap-3">
        {later.length ? (
          <form onSubmit={onAdvance} className="flex flex-wrap items-end gap-2">
            <SelectField
              label="Next step"
              name="to"
              value={to}
              onChange={(e) => setTo(e.target.value)}
              errors={advance.fields.to}
            >
              {later.map((s) => (
                <option key={s} value={s}>
                  {STATUS_LABELS[s]}
                </option>
              ))}
            </SelectField>
            <SubmitButton disabled={advance.busy}>
              {advance.busy ? 'Moving…' : `Move to ${STATUS_LABELS[to]?.toLowerCase() ?? 'next step'}`}
            </SubmitButton>
          </form>
        ) : null}
        {status === 'testing' && release ? (
          <ConfirmDialog
            trigger="Release to a tank…"
            triggerVariant="primary"
            disabled={!release.tanks.length}
            beforeOpen={() => saved('releasing')}
            title={`Release batch${number ? ` ${number}` : ''} to a tank`}
            tone="primary"
            confirmLabel="Release — can’t be undone"
            busyLabel="Releasing…"
            onConfirm={async (d) => {
              const body = {
                tankId: str(d, 'tankId'),
                volume: numberOf(str(d, 'volume')) as number,
                reason: str(d, 'reason').trim() || undefined,
              };
              const r = await callApi(
                (b) => apiClient.POST('/api/coops/{coop}/batches/{id}/release', { params: { path }, body: b }),
                { schema: 'batchReleaseSchema', body },
              );
              return outcome(r, `${name} is released into the tank.`);
            }}
          >
            {(fields, id) => (
              <>
                <div className="flex flex-col gap-1 text-sm">
                  <p>
                    <span className="font-semibold">Quality:</span>{' '}
                    <QualityBadge text={release.verdictText} kind={release.verdictKind} />
                  </p>
                  <p>
                    <span className="font-semibold">Home quick tests:</span> {release.screeningText}
                  </p>
                </div>
                <SelectField
                  label="Into tank"
                  name="tankId"
                  id={id('tankId')}
                  defaultValue={String(defaultTank(release) ?? '')}
                  errors={fields.tankId}
                >
                  {release.tanks.map((t) => (
                    <option key={t.id} value={t.id}>
                      {t.name} — room for{' '}
                      {formatVolume(Math.max(0, t.capacityLiters - t.onHandLiters), release.units, 0)}
                    </option>
                  ))}
                </SelectField>
                <TextField
                  label={`Volume released (${volumeLabel(release.units)})`}
                  name="volume"
                  id={id('volume')}
                  inputMode="decimal"
                  errors={fields.volume}
                  hint="Measured into the tank after drying."
                  autoComplete="off"
                />
                {needsReason ? (
                  <TextField
                    label="Why release it now?"
                    name="reason"
                    id={id('reason')}
                    errors={fields.reason}
                    autoComplete="off"
                    hint={`The batch does not meet the standard in full (${release.verdictText}). The reason is kept on the batch record.`}
                  />
                ) : null}
                <p className="text-sm text-stone-700">
                  Releasing takes the chemicals from stock, works out the cost per{' '}
                  {release.units === 'us' ? 'gallon' : 'litre'} and adds the fuel to the tank.{' '}
                  <strong>It can’t be undone.</strong>
                </p>
              </>
            )}
          </ConfirmDialog>
        ) : null}
        <ConfirmDialog
          trigger="Reject batch…"
          beforeOpen={() => saved('rejecting')}
          title={`Reject batch${number ? ` ${number}` : ''}`}
          confirmLabel="Reject — can’t be undone"
          busyLabel="Rejecting…"
          onConfirm={async (d) => {
            const r = await callApi(
              (b) => apiClient.POST('/api/coops/{coop}/batches/{id}/reject', { params: { path }, body: b }),
              { schema: 'batchRejectSchema', body: { reason: str(d, 'reason') } },
            );
            return outcome(r, `${name} is rejected.`);
          }}
        >
          {(fields, id) => (
            <>
              <p className="text-sm text-stone-700">
                A rejected batch is closed for good: chemicals already mixed are written off from stock and no fuel goes
                to a tank. <strong>It can’t be undone.</strong>
              </p>
              <TextField
                label="Why is the batch rejected?"
                name="reason"
                id={id('reason')}
                errors={fields.reason}
                hint="Kept on the batch record."
                autoComplete="off"
              />
            </>
          )}
        </ConfirmDialog>
      </div>
      {status === 'testing' && release && !release.tanks.length ? (
        <Notice tone="warn">There is no active tank to release into. Add a tank first.</Notice>
      ) : null}
    </div>
  );
}
