'use client';

import { useState, type ReactNode } from 'react';

/**
 * The card around every chart: a title, a Chart/Table toggle, a designed empty state, and the
 * table of the same figures — always in the page for assistive tech (the SVG is hidden from
 * them), shown visually when chosen.
 */
export function ChartFrame({
  title,
  empty,
  chart,
  table,
  tableClassName = 'overflow-x-auto',
}: {
  title: string;
  empty: boolean;
  chart: ReactNode;
  table: ReactNode;
  tableClassName?: string;
}) {
  const [view, setView] = useState<'chart' | 'table'>('chart');
  return (
    <section className="rounded-xl border border-stone-200 bg-white p-4 shadow-sm" aria-label={title}>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <h2 className="text-base">{title}</h2>
        <div
          role="group"
          aria-label={`${title}: view`}
          className="flex overflow-hidden rounded-md border border-stone-300 text-xs"
        >
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
      {empty ? (
        <p className="py-8 text-center text-sm text-stone-600">No data for this period yet.</p>
      ) : view === 'chart' ? (
        chart
      ) : null}
      <div className={view === 'table' ? tableClassName : 'sr-only'} tabIndex={view === 'table' ? 0 : -1}>
        {table}
      </div>
    </section>
  );
}
