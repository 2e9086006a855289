import type { ReactNode } from 'react';
import { Card, Notice } from '@/components/ui/notice';
import type { BatchSummaryDto } from '@/lib/brewing';
import type { UnitSystem } from '@/lib/units';
import { VerdictBadge } from './badges';
import { BatchHeader } from './batch-header';
import { dateText, perUnit, vol } from './format';
import { QualityTables } from './quality-table';

/** A batch seen as a summary: an imported past batch, or a released one for a role that sees only what reached the tank. */
export function BatchSummary({
  batch,
  base,
  units,
  currency,
  timeZone,
  lineage,
}: {
  batch: BatchSummaryDto;
  base: string;
  units: UnitSystem;
  currency: string;
  timeZone: string;
  lineage: ReactNode;
}) {
  return (
    <div className="flex flex-col gap-4">
      <BatchHeader batch={batch} base={base} />
      {batch.imported ? (
        <Notice tone="info" title="Imported summary">
          This batch was made before the co-op used Tallyvat and was imported from its records: it has no recipe or
          steps, moved no fuel into a tank, and cannot be changed here.
        </Notice>
      ) : null}
      <Card title={batch.imported ? 'As recorded' : 'In the tank'}>
        <dl className="grid grid-cols-1 gap-2 text-sm sm:grid-cols-3">
          {batch.imported ? (
            <div>
              <dt className="text-stone-600">Oil in</dt>
              <dd className="font-semibold">{vol(batch.oilLiters, units)}</dd>
            </div>
          ) : null}
          <div>
            <dt className="text-stone-600">{batch.imported ? 'Fuel out' : 'Released'}</dt>
            <dd className="font-semibold">
              {vol(batch.release?.releasedLiters, units)}
              {batch.release?.tankName ? ` into ${batch.release.tankName}` : ''}
            </dd>
          </div>
          {batch.imported ? null : (
            <div>
              <dt className="text-stone-600">On</dt>
              <dd className="font-semibold">{dateText(batch.release?.releasedAt, timeZone)}</dd>
            </div>
          )}
          <div>
            <dt className="text-stone-600">Cost</dt>
            <dd className="font-semibold">
              {perUnit(batch.costPerGallonCents, batch.costPerLiterCents, units, currency)}
            </dd>
          </div>
        </dl>
      </Card>
      {lineage}
      {batch.imported ? (
        <Card title="Quality, as recorded">
          <p className="text-sm">
            <VerdictBadge verdict={batch.qualityVerdict === 'incomplete' ? 'not tested' : batch.qualityVerdict} />
          </p>
          {batch.imported.notes ? <p className="mt-2 text-sm whitespace-pre-line">{batch.imported.notes}</p> : null}
        </Card>
      ) : (
        <Card title="Quality">
          <QualityTables quality={batch.quality} screening={batch.quickTestEvaluation} units={units} />
        </Card>
      )}
    </div>
  );
}
