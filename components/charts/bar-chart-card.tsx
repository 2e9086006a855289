'use client';

import dynamic from 'next/dynamic';
import { xText } from './x-text';
import { ChartFrame } from './chart-frame';
import type { Series } from './series';
import { WhenVisible } from './when-visible';

export type { Series };

// The drawing library loads in its own chunk, when the chart scrolls into view (not first-load).
const BarChartDrawing = dynamic(() => import('./bar-chart-drawing').then((m) => m.BarChartDrawing), { ssr: false });

/**
 * A labelled bar chart with a "Table" toggle showing the same numbers, so the figures are
 * readable without the picture (screen readers get the table; the SVG is hidden from them). The
 * picture is drawn once the card nears the screen.
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
          <WhenVisible>
            <BarChartDrawing data={data} xKey={xKey} series={series} yLabel={yLabel} stacked={stacked} format={format} />
          </WhenVisible>
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
