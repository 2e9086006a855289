import { createColumnHelper } from '@tanstack/react-table';
import type { DataColumn, Features } from '@/components/data-table/data-table';
import { ROLES, type Role } from '@/lib/auth/roles';
import type { MemberDto } from '@/lib/members';

/** A members-table row as the page hands it to the client (dates already worded in the co-op's zone). */
export type MemberRow = Pick<MemberDto, 'id' | 'name' | 'email' | 'role' | 'status' | 'isYou'> & {
  joinedLabel: string;
  /** The co-op's only active admin: cannot be demoted, suspended or removed. */
  lastAdmin: boolean;
};

export interface MemberActions {
  busyId: number | null;
  confirmingRemove: number | null;
  setRole: (row: MemberRow, role: Role) => void;
  setStatus: (row: MemberRow, status: 'active' | 'suspended') => void;
  askRemove: (row: MemberRow | null) => void;
  remove: (row: MemberRow) => void;
}

const h = createColumnHelper<Features, MemberRow>();

const badge = (status: MemberRow['status']) =>
  status === 'active' ? (
    <span className="inline-block rounded-full bg-ok-50 px-2 py-0.5 text-xs font-semibold text-ok-700">Active</span>
  ) : (
    <span className="inline-block rounded-full bg-warn-50 px-2 py-0.5 text-xs font-semibold text-warn-700">Suspended</span>
  );

/** Columns of the members table; the ids match the server's sort keys. */
export function memberColumns(a: MemberActions): DataColumn<MemberRow>[] {
  return [
    h.accessor('name', {
      header: 'Name',
      cell: ({ row }) => (
        <span className="font-medium text-stone-900">
          {row.original.name}
          {row.original.isYou ? <span className="ml-2 rounded bg-stone-100 px-1.5 py-0.5 text-xs font-normal text-stone-700">you</span> : null}
        </span>
      ),
    }),
    h.accessor('email', { header: 'E-mail', cell: ({ row }) => <span className="whitespace-nowrap">{row.original.email}</span> }),
    h.accessor('role', {
      header: 'Role',
      cell: ({ row }) => {
        const r = row.original;
        return (
          <select
            aria-label={`Role of ${r.name}`}
            className="min-h-10 rounded-md border border-stone-300 bg-white px-2 py-1 text-sm disabled:bg-stone-100"
            value={r.role}
            disabled={a.busyId === r.id || r.lastAdmin}
            title={r.lastAdmin ? 'The only active admin keeps the admin role.' : undefined}
            onChange={(e) => a.setRole(r, e.target.value as Role)}
          >
            {ROLES.map((role) => (
              <option key={role} value={role}>{role}</option>
            ))}
          </select>
        );
      },
    }),
    h.accessor('status', { header: 'Status', cell: ({ row }) => badge(row.original.status) }),
    h.accessor('joinedLabel', { id: 'joined', header: 'Joined', cell: ({ row }) => <span className="whitespace-nowrap">{row.original.joinedLabel}</span> }),
    h.display({
      id: 'actions',
      // No visually-hidden text in here: absolutely positioned sr-only spans escape the table's
      // sideways-scrolling box and widen the page on phones. Buttons carry aria-labels instead.
      header: 'Actions',
      cell: ({ row }) => {
        const r = row.original;
        const busy = a.busyId === r.id;
        if (r.lastAdmin) return <span className="text-xs text-stone-600">Only active admin</span>;
        if (a.confirmingRemove === r.id) {
          return (
            <span className="flex flex-wrap items-center gap-2">
              <span className="text-xs text-stone-700">Remove {r.name}?</span>
              <button type="button" className="min-h-10 rounded-md bg-danger-600 px-3 text-xs font-semibold text-white hover:bg-danger-700" disabled={busy} onClick={() => a.remove(r)}>
                Yes, remove
              </button>
              <button type="button" className="min-h-10 rounded-md border border-stone-300 px-3 text-xs font-semibold" onClick={() => a.askRemove(null)}>
                Cancel
              </button>
            </span>
          );
        }
        return (
          <span className="flex flex-wrap gap-2">
            {r.status === 'active' ? (
              <button type="button" className="min-h-10 rounded-md border border-stone-300 bg-white px-3 text-xs font-semibold text-stone-900 hover:bg-stone-100" disabled={busy} aria-label={`Suspend ${r.name}`} onClick={() => a.setStatus(r, 'suspended')}>
                Suspend
              </button>
            ) : (
              <button type="button" className="min-h-10 rounded-md border border-stone-300 bg-white px-3 text-xs font-semibold text-stone-900 hover:bg-stone-100" disabled={busy} aria-label={`Reinstate ${r.name}`} onClick={() => a.setStatus(r, 'active')}>
                Reinstate
              </button>
            )}
            <button type="button" className="min-h-10 rounded-md px-3 text-xs font-semibold text-danger-700 hover:bg-danger-50" disabled={busy} aria-label={`Remove ${r.name}`} onClick={() => a.askRemove(r)}>
              Remove
            </button>
          </span>
        );
      },
    }),
  ];
}
