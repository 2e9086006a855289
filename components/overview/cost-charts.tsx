'use client';

import { BarChartCard } from '@/components/charts/bar-chart-card';
import { formatCents } from '@/lib/money/format';
import type { UnitSystem } from '@/lib/units';
import type { BatchCost } from '@/lib/overview/types';

const KINDS = [
  { key: 'methanol', label: 'Methanol' },
  { key: 'catalyst', label: 'Catalyst' },
  { key: 'energy', label: 'Energy' },
  { key: 'feedstock', label: 'Feedstock' },
  { key: 'other', label: 'Other' },
] as const;

const LITERS_PER_US_GALLON = 3.785411784; // NIST Handbook 44 (exact)

/** Released batches' cost per gallon (or litre) stacked by kind, in the co-op's currency. */
export function BatchCostChart({
  units,
  currency,
  costs,
}: {
  units: UnitSystem;
  currency: string;
  costs: BatchCost[];
}) {
  const per = units === 'us' ? 'gal' : 'L';
  const toUnit = (centsPerGallon: number) =>
    (units === 'us' ? centsPerGallon : centsPerGallon / LITERS_PER_US_GALLON) / 100;
  const money = (v: number) =>
    v.toLocaleString('en-US', { style: 'currency', currency, minimumFractionDigits: 2, maximumFractionDigits: 2 });
  return (
    <BarChartCard
      title={`Cost per ${per === 'gal' ? 'gallon' : 'litre'}, last finished batches`}
      xKey="batch"
      xLabel="Batch"
      yLabel={`${currency} per ${per}`}
      stacked
      series={KINDS.map((k) => ({ key: k.key, label: k.label }))}
      format={money}
      data={costs.map((c) => ({
        batch: `#${c.number} (${c.releasedOn})`,
        ...Object.fromEntries(KINDS.map((k) => [k.key, Math.round(toUnit(c[k.key]) * 1000) / 1000])),
      }))}
    />
  );
}

/** Members owing the most on issued invoices. */
export function BalancesChart({
  currency,
  rows,
}: {
  currency: string;
  rows: { name: string; outstandingCents: number }[];
}) {
  return (
    <BarChartCard
      title="Members with the largest unpaid balances"
      xKey="member"
      xLabel="Member"
      yLabel={currency}
      series={[{ key: 'owed', label: 'Unpaid' }]}
      format={(v) => formatCents(Math.round(v * 100), currency)}
      data={rows.map((r) => ({ member: r.name, owed: r.outstandingCents / 100 }))}
    />
  );
}
