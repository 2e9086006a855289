'use client';

import { useState } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
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
  const [view, setView] = useState<'chart' | 'table'>('chart');
  return (
    <section className="rounded-xl border border-stone-200 bg-white p-4 shadow-sm" aria-label={title}>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <h2 className="text-base">{title}</h2>
        <div role="group" aria-label={`${title}: view`} className="flex overflow-hidden rounded-md border border-stone-300 text-xs">
          {(['chart', 'table'] as const).map((v) => (
            <button
              key={v}
              type="button"
              aria-pressed={view === v}
              onClick={() => setView(v)}
              className={`min-h-9 px-3 ${view === v ? 'bg-fir-700 text-white' : 'bg-white text-stone-800'}`}
            >
              {v === 'chart' ? 'Chart' : 'Table'}
            </button>
          ))}
        </div>
      </div>
      {data.length === 0 ? (
        <p className="py-8 text-center text-sm text-stone-600">No data for this period yet.</p>
      ) : view === 'chart' ? (
        <div className="h-64 w-full" aria-hidden="true">
          <ResponsiveContainer width="100%" height="100%">
            <BarChart accessibilityLayer={false} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
              <CartesianGrid strokeDasharray="3 3" stroke="#e7e5e4" />
              <XAxis dataKey={xKey} tick={{ fontSize: 12, fill: '#44403c' }} />
              <YAxis tick={{ fontSize: 12, fill: '#44403c' }} tickFormatter={(v: number) => format(v)} label={{ value: yLabel, angle: -90, position: 'insideLeft', fill: '#44403c', fontSize: 12 }} />
              <Tooltip formatter={(v) => format(Number(v))} />
              <Legend wrapperStyle={{ fontSize: 12 }} />
              {series.map((s, i) => (
                <Bar key={s.key} dataKey={s.key} name={s.label} fill={SERIES_COLORS[i % SERIES_COLORS.length]} stackId={stacked ? 'a' : undefined} />
              ))}
            </BarChart>
          </ResponsiveContainer>
        </div>
      ) : null}
      {/* The table is always in the page for assistive tech; shown visually when chosen. */}
      <div className={view === 'table' ? 'overflow-x-auto' : 'sr-only'} tabIndex={view === 'table' ? 0 : -1}>
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
                <th scope="row" className="py-1 pr-3 font-medium">{d[xKey]}</th>
                {series.map((s) => <td key={s.key} className="py-1 pr-3 text-right tabular-nums">{format(Number(d[s.key] ?? 0))}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
