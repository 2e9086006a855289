'use client';

import dynamic from 'next/dynamic';
import { xText } from './x-text';
import { ChartFrame } from './chart-frame';
import { WhenVisible } from './when-visible';

// The drawing library loads in its own chunk, when the chart scrolls into view (not first-load).
const LineChartDrawing = dynamic(() => import('./line-chart-drawing').then((m) => m.LineChartDrawing), { ssr: false });

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
          <WhenVisible>
            <LineChartDrawing data={data} xKey={xKey} yKey={yKey} yLabel={yLabel} seriesLabel={seriesLabel} format={format} />
          </WhenVisible>
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
