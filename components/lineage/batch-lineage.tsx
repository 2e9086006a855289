import { dateText, money, vol } from '@/components/brewing/format';
import { StepForm } from '@/components/brewing/step-form';
import { UploadForm } from '@/components/forms/upload-form';
import { Card, Notice } from '@/components/ui/notice';
import type { BatchLineage, ReviewDto } from '@/lib/lineage';
import type { FuelStandard } from '@/lib/quality';
import { RECALL_CAUTIONS, RECALL_DEFERENCE } from '@/lib/safety';
import type { UnitSystem } from '@/lib/units';
import { LateLabForm } from './late-lab-form';

const OUTCOME = { cleared: 'Cleared', retreated: 'Re-treated', disposed: 'Disposed of' } as const;
const KIND_LABEL: Record<string, string> = {
  release: 'Released into tanks',
  draw: 'Drawn by members',
  'draw-reversal': 'Returned by reversals',
  'transfer-out': 'Moved out of tanks',
  'transfer-in': 'Moved into tanks',
  'dip-adjustment': 'Dip adjustments',
  disposal: 'Disposed of',
  retreat: 'Taken for re-treatment',
};

function ReviewLine({ r, units }: { r: ReviewDto; units: UnitSystem }) {
  return (
    <li className="border-b border-stone-100 py-2 text-sm">
      <p>
        <strong>{r.status === 'open' ? 'Under review' : OUTCOME[r.outcome!]}</strong> — opened {dateText(r.openedAt)} (
        {r.cause === 'lab-result' ? 'late laboratory result' : 'flagged'})
        {r.closedAt ? `, closed ${dateText(r.closedAt)}` : ''}.
      </p>
      <p>Finding: {r.finding}</p>
      <p className="text-stone-700">
        Held when opened: {vol(r.heldLiters, units, 2)}.{r.outcomeNotes ? ` Outcome notes: ${r.outcomeNotes}` : ''}
        {r.disposalMethod ? ` Method: ${r.disposalMethod}.` : ''}
      </p>
    </li>
  );
}

/**
 * Where a released batch's fuel went, its reviews and (for brewers and admins) the forms that
 * put it under review, record a late lab result and close the review with its outcome.
 */
export function BatchLineageSection({
  lineage,
  coop,
  units,
  currency,
  canWrite,
  showValue,
  standard,
  receipts,
  retreatBatches,
}: {
  lineage: BatchLineage;
  coop: string;
  units: UnitSystem;
  currency: string;
  canWrite: boolean;
  showValue: boolean;
  standard: FuelStandard;
  receipts: { id: number; name: string }[];
  retreatBatches: { id: number; number: number }[];
}) {
  const apiUrl = `/api/coops/${coop}/batches/${lineage.batchId}`;
  const open = lineage.reviews.find((r) => r.status === 'open') ?? null;
  const drawnMl = lineage.members.reduce((a, m) => a + m.batchMl, 0);
  const valueCents = lineage.members.reduce((a, m) => a + m.valueCents, 0);
  return (
    <>
      {open ? (
        <Notice tone="danger" title={`Batch ${lineage.number} is under review`}>
          <p>{open.finding}</p>
          <p className="mt-1">
            Its fuel is held in {lineage.inTanks.length ? lineage.inTanks.map((t) => t.tankName).join(', ') : 'no tank'}
            : it cannot be reserved, drawn or moved until the review is closed. {lineage.members.length} member
            {lineage.members.length === 1 ? '' : 's'} who drew it {lineage.members.length === 1 ? 'was' : 'were'}{' '}
            e-mailed.
          </p>
        </Notice>
      ) : null}
      <Card title="Where this batch’s fuel went">
        <dl className="grid grid-cols-1 gap-2 text-sm sm:grid-cols-3">
          <div>
            <dt className="text-stone-600">Still in tanks</dt>
            <dd className="font-semibold">
              {lineage.inTanks.length
                ? lineage.inTanks.map((t) => `${vol(t.ml / 1000, units, 2)} in ${t.tankName}`).join('; ')
                : 'None'}
            </dd>
          </div>
          <div>
            <dt className="text-stone-600">Drawn by members (net)</dt>
            <dd className="font-semibold">
              {vol(drawnMl / 1000, units, 2)} by {lineage.members.length}
            </dd>
          </div>
          {showValue ? (
            <div>
              <dt className="text-stone-600">Fuel charge for it (possible credit)</dt>
              <dd className="font-semibold">{money(valueCents, currency)}</dd>
            </div>
          ) : null}
        </dl>
        <ul className="mt-2 text-sm text-stone-700">
          {Object.entries(lineage.byKind).map(([k, ml]) => (
            <li key={k}>
              {KIND_LABEL[k] ?? k}: {vol(Math.abs(ml!) / 1000, units, 2)}
            </li>
          ))}
        </ul>
        <p className="mt-2 text-xs text-stone-600">
          Shares per draw follow each tank’s mixing model (well mixed: in proportion; first in, first out: oldest fuel
          first) — the co-op’s best estimate, not a measurement.
        </p>
        <h3 className="mb-1 mt-4 font-semibold text-fir-900">Members who drew it</h3>
        {lineage.members.length ? (
          <div className="overflow-x-auto">
            <table className="w-full text-sm">
              <caption className="sr-only">Members who drew fuel from batch {lineage.number}</caption>
              <thead>
                <tr className="border-b border-stone-300 text-left">
                  <th scope="col" className="py-1">
                    Member
                  </th>
                  <th scope="col" className="py-1 text-right">
                    Received
                  </th>
                  {showValue ? (
                    <th scope="col" className="py-1 text-right">
                      Fuel charge
                    </th>
                  ) : null}
                </tr>
              </thead>
              <tbody>
                {lineage.members.map((m) => (
                  <tr key={m.membershipId} className="border-b border-stone-100">
                    <td className="py-1">{m.name}</td>
                    <td className="py-1 text-right">{vol(m.batchMl / 1000, units, 3)}</td>
                    {showValue ? <td className="py-1 text-right">{money(m.valueCents, currency)}</td> : null}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : (
          <p className="text-sm text-stone-600">No member has drawn fuel from this batch.</p>
        )}
        {lineage.draws.length ? (
          <details className="mt-3">
            <summary className="cursor-pointer font-semibold text-fir-800">
              Affected draws ({lineage.draws.length})
            </summary>
            <ul className="mt-2 text-sm">
              {lineage.draws.map((d) => (
                <li key={d.drawId} className="border-b border-stone-100 py-1">
                  #{d.drawId} · {dateText(d.occurredAt)} · {d.memberName} at {d.tankName}:{' '}
                  {vol(d.batchMl / 1000, units, 3)} of this batch in a draw of{' '}
                  {vol(Math.abs(d.drawMl) / 1000, units, 3)}
                  {d.isReversal ? ' (reversal)' : ''}
                </li>
              ))}
            </ul>
          </details>
        ) : null}
        <p className="mt-3 flex flex-wrap gap-3 text-sm">
          <a className="underline" href={`${apiUrl}/recall-report?format=pdf`}>
            Recall report (PDF)
          </a>
          <a className="underline" href={`${apiUrl}/recall-report?format=csv`}>
            Recall report (CSV)
          </a>
        </p>
      </Card>
      {lineage.reviews.length || canWrite ? (
        <Card title="Quality review">
          {lineage.reviews.length ? (
            <ul className="mb-3">
              {lineage.reviews.map((r) => (
                <ReviewLine key={r.id} r={r} units={units} />
              ))}
            </ul>
          ) : (
            <p className="mb-3 text-sm text-stone-600">This batch has not been under review.</p>
          )}
          <Notice tone="warn" title="What members who drew a batch under review are told">
            <ul className="list-disc pl-5">
              {RECALL_CAUTIONS.map((c) => (
                <li key={c}>{c}</li>
              ))}
            </ul>
            <p className="mt-1">{RECALL_DEFERENCE}</p>
          </Notice>
          {canWrite && !open ? (
            <div className="mt-4 grid gap-4">
              <details className="rounded-lg border border-stone-200 p-3">
                <summary className="cursor-pointer font-semibold text-fir-800">Record a late laboratory result</summary>
                <div className="mt-3">
                  <LateLabForm url={apiUrl} standard={standard} />
                </div>
              </details>
              <details className="rounded-lg border border-stone-200 p-3">
                <summary className="cursor-pointer font-semibold text-fir-800">Flag this batch for review</summary>
                <div className="mt-3">
                  <StepForm
                    url={`${apiUrl}/review`}
                    method="POST"
                    submitLabel="Put under review"
                    okText="The batch is under review."
                    fields={[
                      {
                        name: 'finding',
                        label: 'What was found',
                        kind: 'textarea',
                        hint: 'E.g. members report clogged filters; a retained sample is cloudy.',
                      },
                    ]}
                  />
                </div>
              </details>
            </div>
          ) : null}
          {canWrite && open ? (
            <div className="mt-4 grid gap-4">
              <h3 className="font-semibold text-fir-900">Close the review</h3>
              <p className="text-sm text-stone-700">
                Disposal needs its receipt: upload it here first, then choose it below.
              </p>
              <UploadForm
                target={{ to: 'batch-files', coop, batchId: lineage.batchId }}
                id="receipt"
                accept="application/pdf,image/jpeg,image/png"
                label="Disposal receipt (PDF, JPEG or PNG)"
                purposes={[{ value: 'receipt', label: 'Disposal receipt' }]}
              />
              <StepForm
                url={`${apiUrl}/review/close`}
                method="POST"
                submitLabel="Close the review"
                okText="Review closed."
                fields={[
                  {
                    name: 'outcome',
                    label: 'Outcome',
                    kind: 'select',
                    defaultValue: 'cleared',
                    options: [
                      { value: 'cleared', label: 'Cleared — the fuel is fit to use' },
                      { value: 'retreated', label: 'Re-treated in a new batch' },
                      { value: 'disposed', label: 'Disposed of' },
                    ],
                  },
                  { name: 'notes', label: 'Why (e.g. the re-test result)', kind: 'textarea' },
                  {
                    name: 'disposalMethod',
                    label: 'Disposal method (if disposed of)',
                    kind: 'text',
                    omitEmpty: true,
                    hint: 'E.g. collected by a licensed waste-oil hauler. Follow local rules.',
                  },
                  {
                    name: 'receiptFileId',
                    label: 'Disposal receipt',
                    kind: 'select',
                    omitEmpty: true,
                    options: [
                      { value: '', label: receipts.length ? 'Choose a receipt' : 'No receipt uploaded yet' },
                      ...receipts.map((f) => ({ value: String(f.id), label: f.name })),
                    ],
                  },
                  {
                    name: 'retreatBatchId',
                    label: 'Batch that re-treats the fuel (if re-treated)',
                    kind: 'select',
                    omitEmpty: true,
                    options: [
                      { value: '', label: retreatBatches.length ? 'Choose a batch' : 'No batch in progress' },
                      ...retreatBatches.map((b) => ({ value: String(b.id), label: `Batch ${b.number}` })),
                    ],
                  },
                ]}
              />
            </div>
          ) : null}
        </Card>
      ) : null}
    </>
  );
}
