'use client';

import dynamic from 'next/dynamic';
import { ChartTable } from './chart-table';
import { ChartFrame } from './chart-frame';
import { WhenVisible } from './when-visible';

// The drawing library loads in its own chunk, when the chart scrolls into view (not first-load).
const LineChartDrawing = dynamic(() => import('./line-chart-drawing').then((m) => m.LineChartDrawing), { ssr: false });

/** A labelled line chart (one series) with a table view of the same numbers. */
export function LineChartCard({
  title,
  data,
  xKey,
  yKey,
  yLabel,
  seriesLabel,
  format = (v: number) => v.toLocaleString('en-US', { maximumFractionDigits: 1 }),
}: {
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
            <LineChartDrawing
              data={data}
              xKey={xKey}
              yKey={yKey}
              yLabel={yLabel}
              seriesLabel={seriesLabel}
              format={format}
            />
          </WhenVisible>
        </div>
      }
      table={
        <ChartTable
          title={title}
          yLabel={yLabel}
          data={data}
          xKey={xKey}
          xLabel="Date"
          columns={[{ key: yKey, label: `${seriesLabel} (${yLabel})` }]}
          format={format}
        />
      }
    />
  );
}
