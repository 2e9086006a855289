import { xText } from './x-text';

/** The numbers behind a chart, as a table: one row per x value, one column per series. */
export function ChartTable({
  title,
  yLabel,
  data,
  xKey,
  xLabel,
  columns,
  format,
}: {
  title: string;
  yLabel: string;
  data: Record<string, string | number>[];
  xKey: string;
  xLabel: string;
  columns: { key: string; label: string }[];
  format: (v: number) => string;
}) {
  return (
    <table className="w-full text-left text-sm">
      <caption className="sr-only">
        {title} ({yLabel})
      </caption>
      <thead>
        <tr className="border-b border-stone-200 text-xs uppercase text-stone-700">
          <th scope="col" className="py-1 pr-3">
            {xLabel}
          </th>
          {columns.map((c) => (
            <th key={c.key} scope="col" className="py-1 pr-3 text-right">
              {c.label}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {data.map((d) => (
          <tr key={String(d[xKey])} className="border-b border-stone-100">
            <th scope="row" className="py-1 pr-3 font-medium">
              {xText(d[xKey])}
            </th>
            {columns.map((c) => (
              <td key={c.key} className="py-1 pr-3 text-right tabular-nums">
                {format(Number(d[c.key] ?? 0))}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
