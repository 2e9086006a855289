import { createColumnHelper } from '@tanstack/react-table';
import type { DataColumn, Features } from '@/components/data-table/data-table';

/** One row of an opening-records file as the preview or the result shows it. */
export interface OpeningImportRow {
  line: number;
  values: Record<string, string>;
  errors: { field: string; message: string }[];
  note: string;
}

const h = createColumnHelper<Features, OpeningImportRow>();

/** Columns: the row number, each of the file's columns (a field with a problem marked), and what the row does or what is wrong. */
export function openingImportColumns(fileColumns: { key: string; heading: string }[]): DataColumn<OpeningImportRow>[] {
  return [
    h.accessor('line', { meta: { priority: 'key' }, header: 'Row' }),
    ...fileColumns.map((c) =>
      h.display({
        id: c.key,
        header: c.heading,
        cell: ({ row }) => {
          const bad = row.original.errors.some((e) => e.field === c.key);
          const v = row.original.values[c.key] ?? '';
          return (
            <span className={bad ? 'font-semibold text-danger-700 underline decoration-wavy' : 'break-all'}>
              {v || (bad ? '(empty)' : '')}
            </span>
          );
        },
      }),
    ),
    h.display({
      id: 'result',
      meta: { priority: 'key' },
      header: 'Result',
      cell: ({ row }) =>
        row.original.errors.length === 0 ? (
          <span className="text-ok-700">{row.original.note || 'Ready'}</span>
        ) : (
          <ul className="list-disc pl-4 text-danger-700">
            {row.original.errors.map((e, i) => (
              <li key={i}>
                <span className="font-semibold">{fileColumns.find((c) => c.key === e.field)?.heading ?? e.field}:</span>{' '}
                {e.message}
              </li>
            ))}
          </ul>
        ),
    }),
  ];
}
