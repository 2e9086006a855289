import { createColumnHelper } from '@tanstack/react-table';
import type { DataColumn, Features } from '@/components/data-table/data-table';
import { ConfirmDialog, type ConfirmOutcome } from '@/components/ui/confirm-dialog';
import { ROLES, ROLE_SUMMARY, withArticle, type Role } from '@/lib/auth/roles';
import type { MemberDto } from '@/lib/members';

/** A members-table row as the page hands it to the client (dates already worded in the co-op's zone). */
export type MemberRow = Pick<MemberDto, 'id' | 'name' | 'email' | 'role' | 'status' | 'isYou'> & {
  joinedLabel: string;
  /** The co-op's only active admin: cannot be demoted, suspended or removed. */
  lastAdmin: boolean;
};

export interface MemberActions {
  /** A role chosen in a row's dropdown but not saved yet. */
  pendingRole: Record<number, Role>;
  pickRole: (row: MemberRow, role: Role) => void;
  saveRole: (row: MemberRow, role: Role) => Promise<ConfirmOutcome>;
  setStatus: (row: MemberRow, status: 'active' | 'suspended') => Promise<ConfirmOutcome>;
  remove: (row: MemberRow) => Promise<ConfirmOutcome>;
}

const h = createColumnHelper<Features, MemberRow>();

const badge = (status: MemberRow['status']) =>
  status === 'active' ? (
    <span className="inline-block rounded-full bg-ok-50 px-2 py-0.5 text-xs font-semibold text-ok-700">Active</span>
  ) : (
    <span className="inline-block rounded-full bg-warn-50 px-2 py-0.5 text-xs font-semibold text-warn-700">
      Suspended
    </span>
  );

const small = 'min-h-10 px-3 text-xs';

/**
 * Columns of the members table; the ids match the server's sort keys. A role is chosen in the
 * dropdown and saved by its own button; saving, suspending and removing are confirmed in a dialog
 * that says what changes for the person.
 */
export function memberColumns(a: MemberActions): DataColumn<MemberRow>[] {
  return [
    h.accessor('name', {
      meta: { priority: 'key' },
      header: 'Name',
      cell: ({ row }) => (
        <span className="font-medium text-stone-900">
          {row.original.name}
          {row.original.isYou ? (
            <span className="ml-2 rounded bg-stone-100 px-1.5 py-0.5 text-xs font-normal text-stone-700">you</span>
          ) : null}
        </span>
      ),
    }),
    h.accessor('email', {
      header: 'E-mail',
      cell: ({ row }) => <span className="break-all">{row.original.email}</span>,
    }),
    h.accessor('role', {
      meta: { priority: 'key' },
      header: 'Role',
      cell: ({ row }) => {
        const r = row.original;
        const chosen = a.pendingRole[r.id] ?? r.role;
        return (
          <span className="flex flex-wrap items-center gap-2">
            <select
              aria-label={`Role of ${r.name}`}
              className="min-h-10 rounded-md border border-stone-300 bg-white px-2 py-1 text-sm disabled:bg-stone-100"
              value={chosen}
              disabled={r.lastAdmin}
              title={r.lastAdmin ? 'The only active admin keeps the admin role.' : undefined}
              onChange={(e) => a.pickRole(r, e.target.value as Role)}
            >
              {ROLES.map((role) => (
                <option key={role} value={role}>
                  {role}
                </option>
              ))}
            </select>
            {chosen !== r.role ? (
              <ConfirmDialog
                trigger="Save role"
                triggerVariant="primary"
                triggerClassName={small}
                triggerLabel={`Save role of ${r.name}`}
                tone="primary"
                title={`Make ${r.name} ${withArticle(chosen)}?`}
                confirmLabel={`Make ${withArticle(chosen)}`}
                busyLabel="Saving…"
                onConfirm={() => a.saveRole(r, chosen)}
              >
                <p className="text-sm text-stone-700">
                  {r.name} is {withArticle(r.role)} now. As {withArticle(chosen)} they can {ROLE_SUMMARY[chosen]}. It
                  counts from their next click.
                </p>
              </ConfirmDialog>
            ) : null}
          </span>
        );
      },
    }),
    h.accessor('status', {
      meta: { priority: 'key' },
      header: 'Status',
      cell: ({ row }) => badge(row.original.status),
    }),
    h.accessor('joinedLabel', {
      id: 'joined',
      header: 'Joined',
      cell: ({ row }) => <span className="whitespace-nowrap">{row.original.joinedLabel}</span>,
    }),
    h.display({
      id: 'actions',
      meta: { priority: 'key' },
      header: 'Actions',
      cell: ({ row }) => {
        const r = row.original;
        if (r.lastAdmin) return <span className="text-xs text-stone-600">Only active admin</span>;
        return (
          <span className="flex flex-wrap gap-2">
            {r.status === 'active' ? (
              <ConfirmDialog
                trigger="Suspend"
                triggerClassName={small}
                triggerLabel={`Suspend ${r.name}`}
                title={`Suspend ${r.name}?`}
                confirmLabel="Suspend"
                busyLabel="Suspending…"
                onConfirm={() => a.setStatus(r, 'suspended')}
              >
                <p className="text-sm text-stone-700">
                  {r.name} can no longer open the co-op from their next click: no reserving, drawing or paying online.
                  Their records and invoices stay. You can reinstate them at any time.
                </p>
              </ConfirmDialog>
            ) : (
              <ConfirmDialog
                trigger="Reinstate"
                triggerClassName={small}
                triggerLabel={`Reinstate ${r.name}`}
                title={`Reinstate ${r.name}?`}
                confirmLabel="Reinstate"
                busyLabel="Reinstating…"
                tone="primary"
                onConfirm={() => a.setStatus(r, 'active')}
              >
                <p className="text-sm text-stone-700">
                  {r.name} can open the co-op again as {withArticle(r.role)}.
                </p>
              </ConfirmDialog>
            )}
            <ConfirmDialog
              trigger="Remove"
              triggerVariant="ghost"
              triggerClassName={`${small} text-danger-700 hover:bg-danger-50`}
              triggerLabel={`Remove ${r.name}`}
              title={`Remove ${r.name} from the co-op?`}
              confirmLabel="Remove"
              busyLabel="Removing…"
              onConfirm={() => a.remove(r)}
            >
              <p className="text-sm text-stone-700">
                {r.name} loses access to the co-op. Their past draws, invoices and payments stay on record. To bring
                them back, send a new invitation.
              </p>
            </ConfirmDialog>
          </span>
        );
      },
    }),
  ];
}
