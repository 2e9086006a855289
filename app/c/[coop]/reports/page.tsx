import type { Metadata } from 'next';
import { formatRate, perGallonToPerUnit } from '@/lib/tank/pricing-policy/convert';
import { BarChartCard } from '@/components/charts/bar-chart-card';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Card, Notice } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { fieldErrors } from '@/lib/http';
import { formatCents } from '@/lib/money';
import { getQuarterlyReport, VOLUME_COLUMNS } from '@/lib/reports/quarterly';
import { formatVolume, volumeFromLiters, volumeLabel } from '@/lib/units';
import { quarterQuerySchema } from '@/lib/validation/reports';

export const metadata: Metadata = { title: 'Reports' };

export default async function ReportsPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop } = await params;
  const sp = await searchParams;
  const actor = await requirePageActor(coop, 'reports:read');
  const now = new Date();
  const parsed = quarterQuerySchema.safeParse({
    year: sp.year ?? now.getUTCFullYear(),
    quarter: sp.quarter ?? Math.floor(now.getUTCMonth() / 3) + 1,
  });
  const errors = parsed.success ? {} : fieldErrors(parsed.error);
  const report = parsed.success ? await getQuarterlyReport(actor, parsed.data) : null;
  const units = actor.coop.units;
  const unit = volumeLabel(units);
  const v = (l: string) => formatVolume(Number(l), units, 1);
  const cols = VOLUME_COLUMNS;
  const base = `/api/coops/${actor.coop.slug}/reports/quarterly?year=${parsed.data?.year ?? ''}&quarter=${parsed.data?.quarter ?? ''}`;
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>Quarterly fuel volumes</h1>
        <p className="text-stone-600">
          Gallons produced, released and drawn by declared use, for road-fuel tax and co-op records.
        </p>
      </div>
      <form
        method="get"
        className="grid grid-cols-2 gap-3 rounded-xl border border-stone-200 bg-white p-4 sm:grid-cols-4 sm:items-end"
      >
        <TextField
          label="Year"
          name="year"
          type="number"
          inputMode="numeric"
          defaultValue={String(parsed.data?.year ?? sp.year ?? '')}
          errors={errors.year}
        />
        <SelectField
          label="Quarter"
          name="quarter"
          defaultValue={String(parsed.data?.quarter ?? sp.quarter ?? '1')}
          errors={errors.quarter}
        >
          <option value="1">Q1 (Jan–Mar)</option>
          <option value="2">Q2 (Apr–Jun)</option>
          <option value="3">Q3 (Jul–Sep)</option>
          <option value="4">Q4 (Oct–Dec)</option>
        </SelectField>
        <Button type="submit" variant="secondary" className="col-span-2 sm:col-span-1">
          Show
        </Button>
      </form>
      {!report ? (
        <Notice tone="danger">Check the year and quarter above.</Notice>
      ) : (
        <>
          <div className="flex flex-wrap gap-2">
            <a
              className="rounded-lg border border-stone-300 bg-white px-4 py-2 text-sm font-semibold no-underline"
              href={`${base}&format=csv`}
            >
              Download CSV
            </a>
            <a
              className="rounded-lg border border-stone-300 bg-white px-4 py-2 text-sm font-semibold no-underline"
              href={`${base}&format=pdf`}
            >
              Download PDF
            </a>
          </div>
          <Card title={`${report.year} Q${report.quarter} — volumes in ${unit === 'gal' ? 'US gallons' : 'litres'}`}>
            <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Quarterly volumes table">
              <table className="w-full min-w-[40rem] text-left text-sm">
                <thead>
                  <tr className="border-b border-stone-200 text-xs uppercase text-stone-700">
                    <th scope="col" className="py-2 pr-3">
                      Month
                    </th>
                    {cols.map((c) => (
                      <th key={c.key} scope="col" className="py-2 pr-3 text-right">
                        {c.label}
                      </th>
                    ))}
                    <th scope="col" className="py-2 pr-3 text-right">
                      Road tax collected
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {[...report.months, report.total].map((m, i) => (
                    <tr
                      key={m.period}
                      className={
                        i === report.months.length
                          ? 'border-t-2 border-stone-300 font-semibold'
                          : 'border-b border-stone-100'
                      }
                    >
                      <th scope="row" className="py-2 pr-3 font-medium">
                        {m.period}
                      </th>
                      {cols.map((c) => (
                        <td key={c.key} className="py-2 pr-3 text-right tabular-nums">
                          {v(m[c.key] as string)}
                        </td>
                      ))}
                      <td className="py-2 pr-3 text-right tabular-nums">
                        {formatCents(m.roadTaxCents, actor.coop.currency)}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            {report.roadTaxCentsPerGallon ? (
              <p className="mt-3 text-sm text-stone-600">
                Road-fuel tax set by the co-op: {formatRate(perGallonToPerUnit(report.roadTaxCentsPerGallon, units))}{' '}
                per {unit === 'gal' ? 'gallon' : 'litre'} on road use.
              </p>
            ) : null}
          </Card>
          <BarChartCard
            title="Drawn by declared use"
            xKey="period"
            yLabel={unit}
            stacked
            series={[
              { key: 'road', label: 'Road' },
              { key: 'offRoad', label: 'Off-road' },
              { key: 'heating', label: 'Heating' },
            ]}
            data={report.months.map((m) => ({
              period: m.period,
              road: round1(volumeFromLiters(Number(m.drawnRoadLiters), units)),
              offRoad: round1(volumeFromLiters(Number(m.drawnOffRoadLiters), units)),
              heating: round1(volumeFromLiters(Number(m.drawnHeatingLiters), units)),
            }))}
          />
          <Notice tone="info" title="Filing">
            {report.disclaimer}
          </Notice>
        </>
      )}
    </div>
  );
}

const round1 = (n: number) => Math.round(n * 10) / 10;
