'use client';

import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { SERIES_COLORS } from './palette';
import { xText } from './x-text';

/** The SVG of LineChartCard (loaded on demand: recharts stays out of the pages' first load). */
export function LineChartDrawing({
  data,
  xKey,
  yKey,
  yLabel,
  seriesLabel,
  format,
}: {
  data: Record<string, string | number>[];
  xKey: string;
  yKey: string;
  yLabel: string;
  seriesLabel: string;
  format: (v: number) => string;
}) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart accessibilityLayer={false} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
        <CartesianGrid strokeDasharray="3 3" stroke="#e7e5e4" />
        <XAxis dataKey={xKey} tickFormatter={xText} tick={{ fontSize: 11, fill: '#44403c' }} minTickGap={24} />
        <YAxis
          tick={{ fontSize: 12, fill: '#44403c' }}
          tickFormatter={(v: number) => format(v)}
          label={{ value: yLabel, angle: -90, position: 'insideLeft', fill: '#44403c', fontSize: 12 }}
        />
        <Tooltip formatter={(v) => format(Number(v))} />
        <Line
          isAnimationActive={false}
          type="stepAfter"
          dataKey={yKey}
          name={seriesLabel}
          stroke={SERIES_COLORS[0]}
          strokeWidth={2}
          dot={false}
        />
      </LineChart>
    </ResponsiveContainer>
  );
}
