'use client';

import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { SERIES_COLORS } from './palette';
import type { Series } from './series';
import { xText } from './x-text';

/** The SVG of BarChartCard (loaded on demand: recharts stays out of the pages' first load). */
export function BarChartDrawing({
  data,
  xKey,
  series,
  yLabel,
  stacked,
  format,
}: {
  data: Record<string, string | number>[];
  xKey: string;
  series: Series[];
  yLabel: string;
  stacked: boolean;
  format: (v: number) => string;
}) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <BarChart accessibilityLayer={false} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
        <CartesianGrid strokeDasharray="3 3" stroke="#e7e5e4" />
        <XAxis dataKey={xKey} tickFormatter={xText} tick={{ fontSize: 12, fill: '#44403c' }} />
        <YAxis
          tick={{ fontSize: 12, fill: '#44403c' }}
          tickFormatter={(v: number) => format(v)}
          label={{ value: yLabel, angle: -90, position: 'insideLeft', fill: '#44403c', fontSize: 12 }}
        />
        <Tooltip formatter={(v) => format(Number(v))} />
        <Legend wrapperStyle={{ fontSize: 12 }} />
        {series.map((s, i) => (
          <Bar
            isAnimationActive={false}
            key={s.key}
            dataKey={s.key}
            name={s.label}
            fill={SERIES_COLORS[i % SERIES_COLORS.length]}
            stackId={stacked ? 'a' : undefined}
          />
        ))}
      </BarChart>
    </ResponsiveContainer>
  );
}
