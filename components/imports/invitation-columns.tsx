import { createColumnHelper } from '@tanstack/react-table';
import type { DataColumn, Features } from '@/components/data-table/data-table';

/** One row of an invitations file as the preview or the result shows it. */
export interface InvitationImportRow {
  line: number;
  name: string;
  email: string;
  role: string;
  fate: string;
  fateLabel: string;
  message: string;
  field: string | null;
  /** After confirming: where the e-mail stands (queued / sent / not-sent), and the invitation's status. */
  delivery?: string | null;
  invitationStatus?: string | null;
}

const h = createColumnHelper<Features, InvitationImportRow>();

const FATE_TONE: Record<string, string> = {
  invite: 'bg-ok-50 text-ok-700',
  member: 'bg-stone-100 text-stone-700',
  invited: 'bg-stone-100 text-stone-700',
  duplicate: 'bg-warn-50 text-warn-700',
};

const DELIVERY: Record<string, { label: string; tone: string }> = {
  queued: { label: 'Waiting to be sent', tone: 'bg-stone-100 text-stone-700' },
  sent: { label: 'Sent', tone: 'bg-ok-50 text-ok-700' },
  'not-sent': { label: 'Not sent', tone: 'bg-warn-50 text-warn-700' },
};

const pill = (tone: string, text: string) => (
  <span className={`inline-block self-start rounded-full px-2 py-0.5 text-xs font-semibold ${tone}`}>{text}</span>
);

/** A cell that carries the row's problem when the problem is in this field. */
const fieldCell = (key: 'name' | 'email' | 'role') =>
  h.accessor(key, {
    header: key === 'email' ? 'E-mail' : key[0]!.toUpperCase() + key.slice(1),
    cell: ({ row }) => {
      const r = row.original;
      const bad = r.field === key && r.fate !== 'duplicate';
      return (
        <span className={bad ? 'font-semibold text-danger-700 underline decoration-wavy' : 'break-all'}>
          {r[key] || (bad ? '(empty)' : '')}
        </span>
      );
    },
  });

/** Columns of the invitations preview and result (with delivery once confirmed). */
export function invitationImportColumns(withDelivery: boolean): DataColumn<InvitationImportRow>[] {
  const cols: DataColumn<InvitationImportRow>[] = [
    h.accessor('line', { meta: { priority: 'key' }, header: 'Row' }),
    fieldCell('name'),
    fieldCell('email'),
    fieldCell('role'),
    h.accessor('fateLabel', {
      meta: { priority: 'key' },
      header: 'Result',
      cell: ({ row }) => (
        <span className="flex flex-col gap-1">
          {pill(FATE_TONE[row.original.fate] ?? 'bg-danger-50 text-danger-700', row.original.fateLabel)}
          {row.original.fate !== 'invite' ? (
            <span className="text-xs text-stone-600">{row.original.message}</span>
          ) : null}
        </span>
      ),
    }),
  ];
  if (withDelivery) {
    cols.push(
      h.accessor('delivery', {
        meta: { priority: 'key' },
        header: 'E-mail',
        cell: ({ row }) => {
          const d = row.original.delivery;
          if (!d) return <span className="text-stone-500">—</span>;
          const s = DELIVERY[d] ?? { label: d, tone: 'bg-stone-100 text-stone-700' };
          return (
            <span className="flex flex-col gap-1">
              {pill(s.tone, s.label)}
              {row.original.invitationStatus && row.original.invitationStatus !== 'pending' ? (
                <span className="text-xs text-stone-600">{row.original.invitationStatus}</span>
              ) : null}
            </span>
          );
        },
      }),
    );
  }
  return cols;
}
