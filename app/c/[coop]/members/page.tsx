import type { Metadata } from 'next';
import Link from 'next/link';
import { InvitationList, type InvitationRow } from '@/components/members/invitation-list';
import { InviteForm } from '@/components/members/invite-form';
import type { MemberRow } from '@/components/members/member-columns';
import { MembersTable } from '@/components/members/members-table';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Card, Notice } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { ROLES } from '@/lib/auth/roles';
import { listPendingInvitations } from '@/lib/members/invitations';
import { listMembers } from '@/lib/members';
import { memberListQuerySchema } from '@/lib/validation/members';
import { formatDate, formatWhen } from '@/lib/dates';

export const metadata: Metadata = { title: 'Members' };

type Search = Record<string, string | string[] | undefined>;

export default async function MembersPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Search>;
}) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'members:manage');

  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const parsed = memberListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : memberListQuerySchema.parse({});
  const [page, invitations] = await Promise.all([listMembers(actor, query), listPendingInvitations(actor)]);
  const tz = actor.coop.timezone;
  const rows: MemberRow[] = page.rows.map((m) => ({
    id: m.id,
    name: m.name,
    email: m.email,
    role: m.role,
    status: m.status,
    isYou: m.isYou,
    joinedLabel: formatDate(m.joinedAt, tz),
    lastAdmin: m.role === 'admin' && m.status === 'active' && page.activeAdmins <= 1,
  }));
  const invitationRows: InvitationRow[] = invitations.map((i) => ({
    id: i.id,
    email: i.email,
    role: i.role,
    delivery: i.delivery,
    expired: i.expired,
    invitedBy: i.invitedBy,
    expiresLabel: formatDate(i.expiresAt, tz),
    sentLabel: i.sentAt ? formatWhen(i.sentAt, tz) : null,
  }));
  const filtered = Boolean(query.role || query.status || query.q);

  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1>Members</h1>
        <p className="text-stone-600">
          Invite people, set their roles, suspend or remove them. Every change is written to the audit log.
        </p>
        <p className="text-sm">
          <Link href={`/c/${actor.coop.slug}/imports`}>Invite many people from a spreadsheet</Link>
        </p>
      </div>

      <div className="grid gap-6 lg:grid-cols-2">
        <Card title="Invite someone">
          <InviteForm coopSlug={actor.coop.slug} />
        </Card>
        <Card title={`Pending invitations (${invitationRows.length})`}>
          <InvitationList coopSlug={actor.coop.slug} invitations={invitationRows} />
        </Card>
      </div>

      <section aria-labelledby="members-heading" className="flex flex-col gap-3">
        <h2 id="members-heading">
          Members ({page.total}
          {filtered ? ' matching' : ''})
        </h2>
        {!parsed.success ? (
          <Notice tone="warn">Some filters in the address were not understood and were ignored.</Notice>
        ) : null}
        <form
          method="get"
          className="grid gap-3 rounded-xl border border-stone-200 bg-white p-4 shadow-sm sm:grid-cols-[1fr_10rem_10rem_auto] sm:items-end"
        >
          <TextField label="Search name or e-mail" id="filter-q" name="q" type="search" defaultValue={query.q ?? ''} />
          <SelectField label="Role" id="filter-role" name="role" defaultValue={query.role ?? ''}>
            <option value="">Any role</option>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {r}
              </option>
            ))}
          </SelectField>
          <SelectField label="Status" id="filter-status" name="status" defaultValue={query.status ?? ''}>
            <option value="">Any status</option>
            <option value="active">Active</option>
            <option value="suspended">Suspended</option>
          </SelectField>
          <input type="hidden" name="sort" value={query.sort} />
          <input type="hidden" name="dir" value={query.dir} />
          <div className="flex gap-2">
            <Button type="submit" variant="secondary">
              Filter
            </Button>
            {filtered ? (
              <Link className="inline-flex min-h-11 items-center px-2 text-sm" href={`/c/${actor.coop.slug}/members`}>
                Clear
              </Link>
            ) : null}
          </div>
        </form>
        <MembersTable
          coopSlug={actor.coop.slug}
          rows={rows}
          pageInfo={{ page: page.page, pageSize: page.pageSize, total: page.total }}
          filtered={filtered}
        />
        {page.activeAdmins <= 1 ? (
          <p className="text-sm text-stone-600">
            This co-op has one active admin. Make a second member an admin so someone can stand in.
          </p>
        ) : null}
      </section>
    </div>
  );
}
