import type { Metadata } from 'next';
import { AuditTable } from '@/components/audit/audit-table';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { listAuditActors, listAuditEvents } from '@/lib/audit/events';
import { fieldErrors, HttpError } from '@/lib/http';
import { auditQuerySchema } from '@/lib/validation/audit';

export const metadata: Metadata = { title: 'Audit log' };

export default async function AuditPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop } = await params;
  const sp = await searchParams;
  const actor = await requirePageActor(coop, 'audit:read');
  const parsed = auditQuerySchema.safeParse(Object.fromEntries(Object.entries(sp).filter(([, v]) => v !== '')));
  const [result, people] = await Promise.all([
    // A day that is not on the calendar (2026-02-31) comes back as a 422 naming the field.
    parsed.success
      ? listAuditEvents(actor, parsed.data).catch((e: unknown) =>
          e instanceof HttpError && e.fields ? e : Promise.reject(e),
        )
      : null,
    listAuditActors(actor),
  ]);
  const data = result instanceof HttpError ? null : result;
  const errors = !parsed.success ? fieldErrors(parsed.error) : result instanceof HttpError ? (result.fields ?? {}) : {};
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>Audit log</h1>
        <p className="text-stone-600">
          Every change made in this co-op: who did what and when, and what each value was and is now. Times are in the
          co-op’s time zone ({actor.coop.timezone}).
        </p>
      </div>
      <form
        method="get"
        className="grid gap-3 rounded-xl border border-stone-200 bg-white p-4 sm:grid-cols-5 sm:items-end"
      >
        <SelectField label="Who" name="actor" defaultValue={sp.actor ?? ''} errors={errors.actor}>
          <option value="">Anyone</option>
          {people.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        <TextField
          label="What"
          name="action"
          defaultValue={sp.action ?? ''}
          placeholder="e.g. member, batch."
          errors={errors.action}
        />
        <TextField label="From" name="from" type="date" defaultValue={sp.from ?? ''} errors={errors.from} />
        <TextField label="To" name="to" type="date" defaultValue={sp.to ?? ''} errors={errors.to} />
        <Button type="submit" variant="secondary">
          Filter
        </Button>
      </form>
      {data ? (
        <AuditTable
          rows={data.rows}
          pageInfo={{ page: data.page, pageSize: data.pageSize, total: data.total }}
          currency={actor.coop.currency}
          units={actor.coop.units}
          timeZone={actor.coop.timezone}
        />
      ) : (
        <Notice tone="danger">Check the filters above.</Notice>
      )}
    </div>
  );
}
