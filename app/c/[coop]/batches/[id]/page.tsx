import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import type { ReactNode } from 'react';
import { BatchActions } from '@/components/brewing/batch-actions';
import { BatchCosts } from '@/components/brewing/batch-costs';
import { BatchFiles } from '@/components/brewing/batch-files';
import { BatchHeader } from '@/components/brewing/batch-header';
import { BatchOutcome } from '@/components/brewing/batch-outcome';
import { BatchPlan } from '@/components/brewing/batch-plan';
import { BatchSteps } from '@/components/brewing/batch-steps';
import { BatchSummary } from '@/components/brewing/batch-summary';
import { StepNav } from '@/components/brewing/step-nav';
import { QualityForm } from '@/components/brewing/quality-form';
import { QualityTables } from '@/components/brewing/quality-table';
import { StepForm } from '@/components/brewing/step-form';
import { Card } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import {
  getBatch,
  listBatches,
  unacknowledgedDangers,
  type BatchDto,
  type BatchSummaryDto,
  type DangerAlert,
} from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { DangerBanner } from '@/components/brewing/danger-banner';
import { HttpError } from '@/lib/http';
import { listTanks, type TankDto } from '@/lib/tank';
import type { UnitSystem } from '@/lib/units';
import { altitudeNote } from '@/lib/chemistry';
import { BatchLineageSection } from '@/components/lineage/batch-lineage';
import { can, type Actor } from '@/lib/auth';
import { getBatchLineage } from '@/lib/lineage';

// The batch record: a summary for imported batches and roles that see only released fuel, else the
// working record step by step (its sections are components/brewing/batch-*.tsx).

export const metadata: Metadata = { title: 'Batch' };

export default async function BatchPage({ params }: { params: Promise<{ coop: string; id: string }> }) {
  const { coop, id } = await params;
  const actor = await requirePageActor(coop, 'batches:read-released', `/c/${coop}/batches/${id}`);
  let batch: BatchDto | BatchSummaryDto;
  try {
    batch = await getBatch(actor, idParam(id), { allowSummary: true });
  } catch (e) {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  }
  const base = `/c/${actor.coop.slug}`;
  const lineage =
    batch.status === 'released' && can(actor.role, 'lineage:read') ? await lineageSection(actor, batch) : null;
  if (batch.view === 'summary')
    return (
      <BatchSummary
        batch={batch}
        base={base}
        units={actor.coop.units}
        currency={actor.coop.currency}
        timeZone={actor.coop.timezone}
        lineage={lineage}
      />
    );
  const [tanks, dangers] = await Promise.all([
    batch.status === 'testing' ? listTanks(actor, { activeOnly: true }) : Promise.resolve([]),
    unacknowledgedDangers(actor.coop.id, batch.id),
  ]);
  const elevationM = actor.coop.settings.elevationM ?? 0;
  const altitude = altitudeNote(elevationM, actor.coop.units);
  return (
    <BatchRecord
      batch={batch}
      base={base}
      units={actor.coop.units}
      currency={actor.coop.currency}
      timeZone={actor.coop.timezone}
      tanks={tanks}
      altitude={altitude}
      dangers={dangers}
      elevationM={elevationM}
      lineage={lineage}
    />
  );
}

/** Where a released batch's fuel went and its reviews (brewers, treasurers, admins); review forms for brewers and admins. */
async function lineageSection(actor: Actor, batch: BatchDto | BatchSummaryDto): Promise<ReactNode> {
  const canWrite = can(actor.role, 'batches:write');
  const [lineage, working] = await Promise.all([
    getBatchLineage(actor, batch.id),
    canWrite
      ? listBatches(actor, { page: 1, pageSize: 50, sort: 'number', dir: 'desc', status: 'in-progress' })
      : Promise.resolve(null),
  ]);
  const planned = canWrite
    ? await listBatches(actor, { page: 1, pageSize: 20, sort: 'number', dir: 'desc', status: 'planned' })
    : null;
  const receipts =
    batch.view === 'full'
      ? batch.files.filter((f) => f.purpose === 'receipt').map((f) => ({ id: f.id, name: f.name }))
      : [];
  return (
    <BatchLineageSection
      lineage={lineage}
      coop={actor.coop.slug}
      units={actor.coop.units}
      currency={actor.coop.currency}
      canWrite={canWrite}
      showValue={can(actor.role, 'billing:manage') || can(actor.role, 'batches:write')}
      standard={batch.quality.standard}
      receipts={receipts}
      retreatBatches={[...(working?.rows ?? []), ...(planned?.rows ?? [])].map((b) => ({ id: b.id, number: b.number }))}
    />
  );
}

/** The working record of a batch: next step, outcome, then each step's section in order. */
function BatchRecord({
  batch,
  base,
  units,
  currency,
  timeZone,
  tanks,
  altitude,
  dangers,
  elevationM,
  lineage,
}: {
  batch: BatchDto;
  base: string;
  units: UnitSystem;
  currency: string;
  timeZone: string;
  tanks: TankDto[];
  altitude: string | null;
  dangers: DangerAlert[];
  elevationM: number;
  lineage: ReactNode;
}) {
  const url = `/api/coops/${base.slice(3)}/batches/${batch.id}`;
  const final = batch.status === 'released' || batch.status === 'rejected';
  const { plan } = batch;

  return (
    <div className="flex flex-col gap-4">
      <BatchHeader batch={batch} base={base} />
      <StepNav status={batch.status} hasActions={!final} />

      <DangerBanner alerts={dangers} slug={base.slice(3)} units={units} canAcknowledge linkToBatch={false} />

      {!final ? (
        <Card title="Next step" id="step-next">
          <BatchActions
            key={batch.status}
            url={url}
            status={batch.status}
            number={batch.number}
            release={
              batch.status === 'testing'
                ? {
                    tanks,
                    units,
                    verdictText: batch.quality.verdict.text,
                    verdictKind: batch.quality.verdict.kind,
                    screeningText: {
                      'looks-good': 'Looks good (screening only)',
                      'needs-attention': 'Needs attention',
                      incomplete: 'Not all done',
                    }[batch.quickTestEvaluation.overall],
                    expectedLiters: plan.projectedFuelLiters,
                  }
                : undefined
            }
          />
        </Card>
      ) : null}

      <BatchOutcome batch={batch} units={units} currency={currency} timeZone={timeZone} />
      {lineage}

      <BatchPlan batch={batch} units={units} url={url} altitude={altitude} />
      <BatchSteps
        batch={batch}
        units={units}
        url={url}
        final={final}
        timeZone={timeZone}
        altitude={altitude}
        elevationM={elevationM}
      />

      <Card title="6. Testing" id="step-testing">
        <QualityTables quality={batch.quality} screening={batch.quickTestEvaluation} units={units} />
        {!final ? (
          <div className="mt-4 border-t border-stone-200 pt-4">
            <QualityForm
              url={url}
              quickTests={batch.quickTests}
              labResults={batch.labResults}
              standard={batch.quality.standard}
            />
          </div>
        ) : null}
      </Card>

      <BatchCosts batch={batch} units={units} currency={currency} url={url} final={final} />
      <BatchFiles files={batch.files} coop={base.slice(3)} batchId={batch.id} />

      <Card title="Notes">
        <StepForm
          url={url}
          disabled={final}
          fields={[{ name: 'notes', label: 'Notes on this batch', kind: 'textarea', defaultValue: batch.notes ?? '' }]}
        />
      </Card>
    </div>
  );
}
