'use client';

import { xText } from './x-text';
import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { ChartFrame } from './chart-frame';
import { SERIES_COLORS } from './palette';

/** A labelled line chart (one series) with a table view of the same numbers. */
export function LineChartCard({ title, data, xKey, yKey, yLabel, seriesLabel, format = (v: number) => v.toLocaleString('en-US', { maximumFractionDigits: 1 }) }: {
  title: string;
  data: Record<string, string | number>[];
  xKey: string;
  yKey: string;
  yLabel: string;
  seriesLabel: string;
  format?: (v: number) => string;
}) {
  return (
    <ChartFrame
      title={title}
      empty={data.length === 0}
      tableClassName="max-h-64 overflow-auto"
      chart={
        <div className="h-56 w-full" aria-hidden="true">
          <ResponsiveContainer width="100%" height="100%">
            <LineChart accessibilityLayer={false} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#e7e5e4" />
              <XAxis dataKey={xKey} tickFormatter={xText} tick={{ fontSize: 11, fill: '#44403c' }} minTickGap={24} />
              <YAxis tick={{ fontSize: 12, fill: '#44403c' }} tickFormatter={(v: number) => format(v)} label={{ value: yLabel, angle: -90, position: 'insideLeft', fill: '#44403c', fontSize: 12 }} />
              <Tooltip formatter={(v) => format(Number(v))} />
              <Line isAnimationActive={false} type="stepAfter" dataKey={yKey} name={seriesLabel} stroke={SERIES_COLORS[0]} strokeWidth={2} dot={false} />
            </LineChart>
          </ResponsiveContainer>
        </div>
      }
      table={
        <table className="w-full text-left text-sm">
          <caption className="sr-only">{title} ({yLabel})</caption>
          <thead>
            <tr className="border-b border-stone-200 text-xs uppercase text-stone-700">
              <th scope="col" className="py-1 pr-3">Date</th>
              <th scope="col" className="py-1 pr-3 text-right">{seriesLabel} ({yLabel})</th>
            </tr>
          </thead>
          <tbody>
            {data.map((d) => (
              <tr key={String(d[xKey])} className="border-b border-stone-100">
                <th scope="row" className="py-1 pr-3 font-medium">{xText(d[xKey])}</th>
                <td className="py-1 pr-3 text-right tabular-nums">{format(Number(d[yKey] ?? 0))}</td>
              </tr>
            ))}
          </tbody>
        </table>
      }
    />
  );
}
