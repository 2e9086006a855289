import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import type { ReactNode } from 'react';
import { StatusBadge, VerdictBadge } from '@/components/brewing/badges';
import { BatchActions } from '@/components/brewing/batch-actions';
import { dateText, grams, money, perUnit, vol } from '@/components/brewing/format';
import { StepNav } from '@/components/brewing/step-nav';
import { QualityForm } from '@/components/brewing/quality-form';
import { QualityTables } from '@/components/brewing/quality-table';
import { SafetyNote } from '@/components/brewing/safety-note';
import { StepForm, type StepField } from '@/components/brewing/step-form';
import { TemperatureLog } from '@/components/brewing/temperature-log';
import { UploadForm } from '@/components/brewing/upload-form';
import { Card, Notice } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { getBatch, unacknowledgedDangers, type BatchDto, type BatchSummaryDto, type DangerAlert } from '@/lib/batches';
import { idParam } from '@/lib/validation/id-param';
import { DangerBanner } from '@/components/brewing/danger-banner';
import { HttpError } from '@/lib/http';
import { listTanks } from '@/lib/tank';
import { volumeFromLiters, volumeLabel, type UnitSystem } from '@/lib/units';
import { altitudeNote } from '@/lib/chemistry';
import { BatchLineageSection } from '@/components/lineage/batch-lineage';
import { can, type Actor } from '@/lib/auth';
import { listBatches } from '@/lib/batches/read';
import { getBatchLineage } from '@/lib/lineage';

export const metadata: Metadata = { title: 'Batch' };

const fixed = (v: number | null, digits: number) => (v === null ? '' : String(Number(v.toFixed(digits))));
const volIn = (liters: number | null, units: UnitSystem) => (liters === null ? '' : String(Number(volumeFromLiters(liters, units).toFixed(2))));
const cents = (c: number | null) => (c === null ? '' : (c / 100).toFixed(2));

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
  const lineage = batch.status === 'released' && can(actor.role, 'lineage:read') ? await lineageSection(actor, batch) : null;
  if (batch.view === 'summary') return <BatchSummary batch={batch} base={base} units={actor.coop.units} currency={actor.coop.currency} timeZone={actor.coop.timezone} lineage={lineage} />;
  const [tanks, dangers] = await Promise.all([batch.status === 'testing' ? listTanks(actor, { activeOnly: true }) : Promise.resolve([]), unacknowledgedDangers(actor.coop.id, batch.id)]);
  const elevationM = actor.coop.settings.elevationM ?? 0;
  const altitude = altitudeNote(elevationM, actor.coop.units);
  return <BatchRecord batch={batch} base={base} units={actor.coop.units} currency={actor.coop.currency} timeZone={actor.coop.timezone} tanks={tanks} altitude={altitude} dangers={dangers} elevationM={elevationM} lineage={lineage} />;
}

/** Where a released batch's fuel went and its reviews (brewers, treasurers, admins); review forms for brewers and admins. */
async function lineageSection(actor: Actor, batch: BatchDto | BatchSummaryDto): Promise<ReactNode> {
  const canWrite = can(actor.role, 'batches:write');
  const [lineage, working] = await Promise.all([
    getBatchLineage(actor, batch.id),
    canWrite ? listBatches(actor, { page: 1, pageSize: 50, sort: 'number', dir: 'desc', status: 'in-progress' }) : Promise.resolve(null),
  ]);
  const planned = canWrite ? await listBatches(actor, { page: 1, pageSize: 20, sort: 'number', dir: 'desc', status: 'planned' }) : null;
  const receipts = batch.view === 'full' ? batch.files.filter((f) => f.purpose === 'receipt').map((f) => ({ id: f.id, name: f.name })) : [];
  return (
    <BatchLineageSection lineage={lineage} apiUrl={`/api/coops/${actor.coop.slug}/batches/${batch.id}`} units={actor.coop.units} currency={actor.coop.currency}
      canWrite={canWrite} showValue={can(actor.role, 'billing:manage') || can(actor.role, 'batches:write')} standard={batch.quality.standard} receipts={receipts}
      retreatBatches={[...(working?.rows ?? []), ...(planned?.rows ?? [])].map((b) => ({ id: b.id, number: b.number }))} />
  );
}

function Header({ number, status, batchDate, base, id, meets, children }: { number: number; status: string; batchDate: string; base: string; id: number; meets: boolean; children?: ReactNode }) {
  return (
    <div className="flex flex-col gap-2">
      <Link href={`${base}/batches`} className="text-sm">← All batches</Link>
      <div className="flex flex-wrap items-center gap-3">
        <h1>Batch {number}</h1>
        <StatusBadge status={status} />
        <span className="text-sm text-stone-600">{dateText(batchDate)}</span>
        {status === 'released' ? (
          <a className="ml-auto inline-flex min-h-11 items-center rounded-lg border border-stone-300 bg-white px-4 py-2 text-sm font-semibold text-stone-900 no-underline hover:bg-stone-100" href={`/api/coops/${base.slice(3)}/batches/${id}/certificate`}>
            {meets ? 'Download certificate (PDF)' : 'Download batch quality record (PDF)'}
          </a>
        ) : null}
      </div>
      {children}
    </div>
  );
}

function BatchSummary({ batch, base, units, currency, timeZone, lineage }: { batch: BatchSummaryDto; base: string; units: UnitSystem; currency: string; timeZone: string; lineage: ReactNode }) {
  return (
    <div className="flex flex-col gap-4">
      <Header number={batch.number} status={batch.status} batchDate={batch.batchDate} base={base} id={batch.id} meets={batch.quality.verdict.kind === 'meets'} />
      {batch.imported ? (
        <Notice tone="info" title="Imported summary">
          This batch was made before the co-op used Tallyvat and was imported from its records: it has no recipe or steps, moved no fuel into a tank, and cannot be changed here.
        </Notice>
      ) : null}
      <Card title={batch.imported ? 'As recorded' : 'In the tank'}>
        <dl className="grid grid-cols-1 gap-2 text-sm sm:grid-cols-3">
          {batch.imported ? <div><dt className="text-stone-600">Oil in</dt><dd className="font-semibold">{vol(batch.oilLiters, units)}</dd></div> : null}
          <div><dt className="text-stone-600">{batch.imported ? 'Fuel out' : 'Released'}</dt><dd className="font-semibold">{vol(batch.release?.releasedLiters, units)}{batch.release?.tankName ? ` into ${batch.release.tankName}` : ''}</dd></div>
          {batch.imported ? null : <div><dt className="text-stone-600">On</dt><dd className="font-semibold">{dateText(batch.release?.releasedAt, timeZone)}</dd></div>}
          <div><dt className="text-stone-600">Cost</dt><dd className="font-semibold">{perUnit(batch.costPerGallonCents, batch.costPerLiterCents, units, currency)}</dd></div>
        </dl>
      </Card>
      {lineage}
      {batch.imported ? (
        <Card title="Quality, as recorded">
          <p className="text-sm"><VerdictBadge verdict={batch.qualityVerdict === 'incomplete' ? 'not tested' : batch.qualityVerdict} /></p>
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

function Figure({ label, value, sub }: { label: string; value: ReactNode; sub?: ReactNode }) {
  return (
    <div className="rounded-lg border border-stone-200 bg-stone-50 p-3">
      <dt className="text-xs uppercase tracking-wide text-stone-600">{label}</dt>
      <dd className="text-lg font-bold text-fir-900">{value}</dd>
      {sub ? <dd className="text-xs text-stone-700">{sub}</dd> : null}
    </div>
  );
}

function BatchRecord({ batch, base, units, currency, timeZone, tanks, altitude, dangers, elevationM, lineage }: {
  batch: BatchDto; base: string; units: UnitSystem; currency: string; timeZone: string; tanks: Awaited<ReturnType<typeof listTanks>>; altitude: string | null; dangers: DangerAlert[]; elevationM: number; lineage: ReactNode;
}) {
  const url = `/api/coops/${base.slice(3)}/batches/${batch.id}`;
  const final = batch.status === 'released' || batch.status === 'rejected';
  const planned = batch.status === 'planned';
  const { plan } = batch;
  const v = volumeLabel(units);
  const methanolPlanned = vol(batch.computedMethanolLiters, units, 2);

  const planFields: StepField[] = [
    { name: 'oilVolume', label: `Oil (${v})`, kind: 'number', defaultValue: volIn(batch.oilLiters, units), omitEmpty: true },
    { name: 'titrationTrials', label: 'Titration trials (mL)', kind: 'list', defaultValue: plan.titration.trials.join(', '), omitEmpty: true, hint: 'Separate trials with commas, e.g. 4.9, 5.1, 5.2' },
    { name: 'titrant', label: 'Titrant the trials used', kind: 'select', defaultValue: plan.titration.titrant, omitEmpty: true, options: [{ value: 'KOH', label: 'KOH solution' }, { value: 'NaOH', label: 'NaOH solution' }] },
    { name: 'titrantFrom', label: 'Titrant made from', kind: 'select', defaultValue: plan.titrantFrom, omitEmpty: true, options: [{ value: 'same-catalyst', label: 'The batch’s own catalyst stock' }, { value: 'pure-reagent', label: 'Pure (reagent-grade) catalyst' }], hint: 'A titrant of the other chemical is always treated as pure reagent.' },
    { name: 'catalyst', label: 'Catalyst', kind: 'select', defaultValue: plan.catalyst, omitEmpty: true, options: [{ value: 'KOH', label: 'KOH' }, { value: 'NaOH', label: 'NaOH' }] },
    { name: 'purityPct', label: 'Purity (%)', kind: 'number', defaultValue: String(plan.purityPct), omitEmpty: true },
    { name: 'baseGramsPerLiter', label: 'Base amount (g per L of oil, pure)', kind: 'number', defaultValue: fixed(plan.baseGramsPerLiter, 3), omitEmpty: true },
    { name: 'methanolPct', label: 'Methanol (% of oil volume)', kind: 'number', defaultValue: plan.methanol.pct === null ? '' : String(plan.methanol.pct), omitEmpty: true },
  ];
  const reactionFields: StepField[] = [
    { name: 'actualCatalystGrams', label: `${plan.catalyst} weighed out (g)`, kind: 'number', defaultValue: fixed(batch.actualCatalystGrams, 1), aside: <>Planned: <strong>{grams(batch.computedCatalystGrams)}</strong></> },
    { name: 'actualMethanol', label: `Methanol measured (${v})`, kind: 'number', defaultValue: volIn(batch.actualMethanolLiters, units), aside: <>Planned: <strong>{methanolPlanned}</strong></> },
    { name: 'mixingMinutes', label: 'Mixing time (minutes)', kind: 'number', defaultValue: batch.mixingMinutes?.toString() ?? '', hint: 'About an hour is usual.' },
  ];
  const costFields: StepField[] = [
    { name: 'energyKwh', label: 'Metered energy (kWh)', kind: 'number', defaultValue: fixed(batch.energy.kwh, 3), hint: 'Or give heater power and hours instead.' },
    { name: 'tariffCentsPerKwh', label: 'Electricity tariff (¢ per kWh)', kind: 'number', defaultValue: fixed(batch.energy.tariffCentsPerKwh, 4),
      aside: batch.energy.costCents !== null ? <>Energy cost: <strong>{money(batch.energy.costCents, currency)}</strong></> : <span className="text-stone-600">Energy is not counted until a tariff and an amount are given.</span> },
    { name: 'heaterKw', label: 'Heater power (kW)', kind: 'number', defaultValue: fixed(batch.energy.heaterKw, 3) },
    { name: 'heaterHours', label: 'Heating time (hours)', kind: 'number', defaultValue: fixed(batch.energy.heaterHours, 2) },
    { name: 'feedstockCost', label: 'Feedstock cost ($), if not the oil lots’ cost', kind: 'number', defaultValue: cents(batch.feedstockCentsOverride),
      aside: <>From the oil lots: <strong>{money(batch.feedstockFromLotsCents, currency)}</strong></> },
    { name: 'otherCost', label: 'Other costs ($)', kind: 'number', defaultValue: cents(batch.otherCents), omitEmpty: true, hint: 'Water, filters, acid for washing…' },
    { name: 'otherNotes', label: 'What the other costs were', kind: 'textarea', defaultValue: batch.otherNotes ?? '' },
  ];

  return (
    <div className="flex flex-col gap-4">
      <Header number={batch.number} status={batch.status} batchDate={batch.batchDate} base={base} id={batch.id} meets={batch.quality.verdict.kind === 'meets'} />
      <StepNav status={batch.status} hasActions={!final} />

      <DangerBanner alerts={dangers} slug={base.slice(3)} units={units} canAcknowledge linkToBatch={false} />

      {!final ? (
        <Card title="Next step" id="step-next">
          <BatchActions
            key={batch.status}
            url={url}
            status={batch.status}
            number={batch.number}
            release={batch.status === 'testing' ? {
              tanks, units, verdictText: batch.quality.verdict.text, verdictKind: batch.quality.verdict.kind,
              screeningText: { 'looks-good': 'Looks good (screening only)', 'needs-attention': 'Needs attention', incomplete: 'Not all done' }[batch.quickTestEvaluation.overall],
              expectedLiters: plan.projectedFuelLiters,
            } : undefined}
          />
        </Card>
      ) : null}

      {batch.status === 'rejected' ? (
        <div id="step-result" className="scroll-mt-28"><Notice tone="danger" title={`Rejected ${dateText(batch.rejectedAt, timeZone)}`}>
          <p>{batch.rejectReason}</p>
          {batch.costs ? <p className="mt-1">Inputs written off: {money(batch.costs.totalCents, currency)}.</p> : null}
        </Notice></div>
      ) : null}

      {batch.status === 'released' && batch.costs && batch.release ? (
        <Card title="Released" id="step-result">
          <dl className="grid grid-cols-1 gap-3 sm:grid-cols-3">
            <Figure label="Into the tank" value={vol(batch.release.releasedLiters, units)} sub={`${batch.release.tankName ?? 'Tank'} · ${dateText(batch.release.releasedAt, timeZone)}`} />
            <Figure label={`Cost per ${units === 'us' ? 'gallon' : 'litre'}`} value={perUnit(batch.costs.costPerGallonCents, batch.costs.costPerLiterCents, units, currency)} />
            <Figure label="Batch cost" value={money(batch.costs.totalCents, currency)} />
          </dl>
          <CostBreakdown costs={batch.costs} currency={currency} />
        </Card>
      ) : null}
      {lineage}

      <Card title="1. Plan" id="step-plan">
        <dl className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4">
          <Figure label="Oil" value={vol(batch.oilLiters, units)} sub={units === 'us' ? `${batch.oilLiters.toFixed(1)} L` : undefined} />
          <Figure label="Titration average" value={`${plan.titration.averageMl.toFixed(2)} mL`} sub={`${plan.titration.source === 'oil-lot' ? 'From the oil lot' : 'Trials'}: ${plan.titration.trials.join(', ')} mL (${plan.titration.titrant})`} />
          <Figure label={`${plan.catalyst} to weigh`} value={grams(batch.computedCatalystGrams)} sub={`${plan.catalystResult.gramsPerLiter.toFixed(2)} g/L at ${plan.purityPct} % purity`} />
          <Figure label="Methanol" value={methanolPlanned} sub={plan.methanol.mode === 'percent' ? `${plan.methanol.pct} % of oil (≈ ${plan.methanol.equivalentMolarRatio.toFixed(1)}:1 molar)` : `${plan.methanol.molarRatio}:1 molar (${plan.methanol.equivalentPct.toFixed(1)} % of oil)`} />
        </dl>
        <p className="mt-3 text-sm text-stone-700"><span className="font-semibold">How the catalyst was worked out:</span> {plan.catalystResult.explanation}</p>
        <p className="mt-1 text-sm text-stone-700">
          Oil acidity: acid number {plan.oil.acidNumber.toFixed(2)} mg KOH/g, free fatty acids {plan.oil.ffaPercent.toFixed(2)} % (as oleic acid). Expected: about {vol(plan.projectedFuelLiters, units)} of fuel ({plan.yieldProjection.explanation.replace(/\.$/, '')}); a crude glycerin layer of about {vol(plan.yields.crudeGlycerinLiters, units)} ({vol(plan.yields.crudeGlycerinRangeLiters[0], units)}–{vol(plan.yields.crudeGlycerinRangeLiters[1], units)}) holding about {vol(plan.yields.glycerolLiters, units)} of pure glycerol.
        </p>
        {plan.oil.needsAcidPretreatment ? <div className="mt-2"><Notice tone="warn">{plan.oil.message}</Notice></div> : null}
        {plan.titration.notice ? <div className="mt-2"><Notice tone="warn">{plan.titration.notice}</Notice></div> : null}
        {batch.oilLots.length ? (
          <p className="mt-2 text-sm">Oil lots: {batch.oilLots.map((o) => `${vol(o.liters, units)} from ${o.collectedFrom} (${dateText(o.collectedOn)})`).join('; ')}.</p>
        ) : <p className="mt-2 text-sm text-stone-600">No oil lots linked to this batch.</p>}
        {planned ? (
          <details className="mt-3 rounded-lg border border-stone-200 p-3">
            <summary className="cursor-pointer font-semibold text-fir-800">Change the plan</summary>
            <div className="mt-3"><StepForm url={url} fields={planFields} submitLabel="Recompute and save" okText="Plan updated." /></div>
          </details>
        ) : null}
        <div className="mt-3"><SafetyNote topics={['methanol', 'lye', 'materials', 'protective-equipment']} title="Before handling methanol and lye" altitude={altitude} /></div>
      </Card>

      <Card title="2. Reaction" id="step-reaction">
        <StepForm url={url} fields={reactionFields} disabled={final} />
        <h3 className="mb-2 mt-4 font-semibold text-fir-900">Temperature</h3>
        <TemperatureLog url={url} readings={batch.temperatures} units={units} timeZone={timeZone} readOnly={final} elevationM={elevationM} />
        <div className="mt-3"><SafetyNote topics={['methanol']} title="Heating methanol and oil" altitude={altitude} /></div>
      </Card>

      <Card title="3. Settling and draining" id="step-settling">
        <StepForm url={url} disabled={final} fields={[
          { name: 'settlingHours', label: 'Settling time (hours)', kind: 'number', defaultValue: fixed(batch.settlingHours, 2), hint: 'Overnight, 8–24 hours, is usual.' },
          { name: 'glycerinDrained', label: `Glycerin drained (${v})`, kind: 'number', defaultValue: volIn(batch.glycerinLiters, units), aside: <>Crude glycerin layer expected: about {vol(plan.yields.crudeGlycerinLiters, units)} (of which about {vol(plan.yields.glycerolLiters, units)} pure glycerol; the rest is methanol, catalyst, soap and some fuel).</> },
        ]} />
        <div className="mt-3"><SafetyNote topics={['waste']} title="Glycerin" /></div>
      </Card>

      <Card title="4. Washing" id="step-washing">
        <StepForm url={url} disabled={final} fields={[
          { name: 'washCycles', label: 'Wash cycles', kind: 'number', defaultValue: batch.washCycles?.toString() ?? '', hint: 'Until the water runs clear and near pH 7.' },
          { name: 'washWater', label: `Wash water used (${v})`, kind: 'number', defaultValue: volIn(batch.washWaterLiters, units) },
        ]} />
        <div className="mt-3"><SafetyNote topics={['waste']} title="Wash water" /></div>
      </Card>

      <Card title="5. Drying" id="step-drying">
        <StepForm url={url} disabled={final} fields={[
          { name: 'dryingMethod', label: 'Drying method', kind: 'select', defaultValue: batch.dryingMethod ?? '', options: [
            { value: '', label: 'Not recorded' }, { value: 'air', label: 'Open air' }, { value: 'bubble', label: 'Bubble drying' }, { value: 'heat', label: 'Heating' },
            { value: 'vacuum', label: 'Vacuum' }, { value: 'settle', label: 'Settling' }, { value: 'other', label: 'Other' },
          ] },
          { name: 'dryingNotes', label: 'Drying notes', kind: 'textarea', defaultValue: batch.dryingNotes ?? '', hint: 'Dry until the fuel is clear (target ≤ 500 ppm water).' },
        ]} />
        <div className="mt-3"><SafetyNote topics={['rags']} title="Fuel-soaked rags" /></div>
      </Card>

      <Card title="6. Testing" id="step-testing">
        <QualityTables quality={batch.quality} screening={batch.quickTestEvaluation} units={units} />
        {!final ? <div className="mt-4 border-t border-stone-200 pt-4"><QualityForm url={url} quickTests={batch.quickTests} labResults={batch.labResults} standard={batch.quality.standard} /></div> : null}
      </Card>

      <Card title="Costs">
        <StepForm url={url} fields={costFields} disabled={final} />
      </Card>


      {batch.consumptions.length ? (
        <Card title="Chemicals taken from stock">
          <ul className="text-sm">
            {batch.consumptions.map((c) => (
              <li key={c.chemicalLotId} className="border-b border-stone-100 py-1">
                {c.unit === 'L' ? vol(c.quantity, units, 2) : grams(c.quantity)} {c.kind} from the lot received {dateText(c.receivedOn)} ({c.supplier}) — {money(c.costCents, currency)}
              </li>
            ))}
          </ul>
        </Card>
      ) : null}

      <Card title="Photos and lab reports">
        {batch.files.length ? (
          <ul className="mb-3 text-sm">
            {batch.files.map((f) => (
              <li key={f.id} className="border-b border-stone-100 py-1">
                <a className="underline" href={`${url}/files/${f.id}`}>{f.name}</a> <span className="text-stone-600">— {f.purpose === 'photo' ? 'photo' : f.purpose === 'receipt' ? 'disposal receipt' : 'lab report'}, {Math.max(1, Math.round(f.sizeBytes / 1024))} KB</span>
              </li>
            ))}
          </ul>
        ) : <p className="mb-3 text-sm text-stone-600">Nothing attached yet.</p>}
        <UploadForm url={`${url}/files`} accept="application/pdf,image/jpeg,image/png" label="PDF, JPEG or PNG" purposes={[{ value: 'lab-report', label: 'Lab report' }, { value: 'photo', label: 'Photo' }]} />
      </Card>

      <Card title="Notes">
        <StepForm url={url} disabled={final} fields={[{ name: 'notes', label: 'Notes on this batch', kind: 'textarea', defaultValue: batch.notes ?? '' }]} />
      </Card>
    </div>
  );
}

function CostBreakdown({ costs, currency }: { costs: NonNullable<BatchDto['costs']>; currency: string }) {
  const rows: [string, number][] = [
    ['Methanol', costs.methanolCents], ['Catalyst', costs.catalystCents], ['Energy', costs.energyCents], ['Feedstock', costs.feedstockCents], ['Other', costs.otherCents],
  ];
  return (
    <table className="mt-3 w-full max-w-sm text-sm">
      <caption className="sr-only">Cost breakdown</caption>
      <tbody>
        {rows.map(([k, c]) => <tr key={k} className="border-b border-stone-100"><th scope="row" className="py-1 text-left font-normal">{k}</th><td className="py-1 text-right">{money(c, currency)}</td></tr>)}
        <tr><th scope="row" className="py-1 text-left">Total</th><td className="py-1 text-right font-semibold">{money(costs.totalCents, currency)}</td></tr>
      </tbody>
    </table>
  );
}
