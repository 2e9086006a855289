'use client';

import { xText } from './x-text';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { ChartFrame } from './chart-frame';
import { SERIES_COLORS } from './palette';

export interface Series {
  key: string;
  label: string;
}

/**
 * A labelled bar chart with a "Table" toggle showing the same numbers, so the figures are
 * readable without the picture (screen readers get the table; the SVG is hidden from them).
 */
export function BarChartCard({
  title,
  data,
  xKey,
  xLabel,
  series,
  yLabel,
  stacked = false,
  format = (v: number) => v.toLocaleString('en-US', { maximumFractionDigits: 1 }),
}: {
  title: string;
  data: Record<string, string | number>[];
  xKey: string;
  /** Header of the table's first column (defaults to "Period"). */
  xLabel?: string;
  series: Series[];
  yLabel: string;
  stacked?: boolean;
  format?: (v: number) => string;
}) {
  return (
    <ChartFrame
      title={title}
      empty={data.length === 0}
      chart={
        <div className="h-64 w-full" aria-hidden="true">
          <ResponsiveContainer width="100%" height="100%">
            <BarChart accessibilityLayer={false} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#e7e5e4" />
              <XAxis dataKey={xKey} tickFormatter={xText} tick={{ fontSize: 12, fill: '#44403c' }} />
              <YAxis tick={{ fontSize: 12, fill: '#44403c' }} tickFormatter={(v: number) => format(v)} label={{ value: yLabel, angle: -90, position: 'insideLeft', fill: '#44403c', fontSize: 12 }} />
              <Tooltip formatter={(v) => format(Number(v))} />
              <Legend wrapperStyle={{ fontSize: 12 }} />
              {series.map((s, i) => (
                <Bar isAnimationActive={false} key={s.key} dataKey={s.key} name={s.label} fill={SERIES_COLORS[i % SERIES_COLORS.length]} stackId={stacked ? 'a' : undefined} />
              ))}
            </BarChart>
          </ResponsiveContainer>
        </div>
      }
      table={
        <table className="w-full text-left text-sm">
          <caption className="sr-only">{title} ({yLabel})</caption>
          <thead>
            <tr className="border-b border-stone-200 text-xs uppercase text-stone-700">
              <th scope="col" className="py-1 pr-3">{xLabel ?? (xKey === 'period' ? 'Period' : xKey)}</th>
              {series.map((s) => <th key={s.key} scope="col" className="py-1 pr-3 text-right">{s.label}</th>)}
            </tr>
          </thead>
          <tbody>
            {data.map((d) => (
              <tr key={String(d[xKey])} className="border-b border-stone-100">
                <th scope="row" className="py-1 pr-3 font-medium">{xText(d[xKey])}</th>
                {series.map((s) => <td key={s.key} className="py-1 pr-3 text-right tabular-nums">{format(Number(d[s.key] ?? 0))}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
      }
    />
  );
}
