'use client';

import dynamic from 'next/dynamic';
import { ChartTable } from './chart-table';
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
            <BarChartDrawing
              data={data}
              xKey={xKey}
              series={series}
              yLabel={yLabel}
              stacked={stacked}
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
          xLabel={xLabel ?? (xKey === 'period' ? 'Period' : xKey)}
          columns={series}
          format={format}
        />
      }
    />
  );
}
