'use client';

import { BarChartCard } from '@/components/charts/bar-chart-card';
import { LineChartCard } from '@/components/charts/line-chart-card';
import { volumeFromLiters, volumeLabel, type UnitSystem } from '@/lib/units';
import type { MonthVolume } from '@/lib/overview/types';

const r1 = (n: number) => Math.round(n * 10) / 10;

/** Gallons released and drawn per month, and tank level over 90 days, in the co-op's units. */
export function VolumeCharts({
  units,
  volumes,
  level,
}: {
  units: UnitSystem;
  volumes: MonthVolume[];
  level: { day: string; onHandLiters: number }[];
}) {
  const unit = volumeLabel(units);
  const hasVolumes = volumes.some((v) => v.releasedLiters !== 0 || v.drawnLiters !== 0);
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <BarChartCard
        title="Fuel made and drawn per month"
        xKey="period"
        yLabel={unit}
        series={[
          { key: 'released', label: 'Released to tanks' },
          { key: 'drawn', label: 'Drawn by members' },
        ]}
        data={
          hasVolumes
            ? volumes.map((v) => ({
                period: v.month,
                released: r1(volumeFromLiters(v.releasedLiters, units)),
                drawn: r1(volumeFromLiters(v.drawnLiters, units)),
              }))
            : []
        }
      />
      <LineChartCard
        title="Tank level, last 90 days"
        xKey="day"
        yKey="onHand"
        yLabel={unit}
        seriesLabel="On hand"
        data={
          level.some((l) => l.onHandLiters > 0)
            ? level.map((l) => ({ day: l.day, onHand: r1(volumeFromLiters(l.onHandLiters, units)) }))
            : []
        }
      />
    </div>
  );
}
