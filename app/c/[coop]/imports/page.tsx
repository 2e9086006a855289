import type { Metadata } from 'next';
import Link from 'next/link';
import { InvitationImporter } from '@/components/imports/invitation-importer';
import { OpeningImporter } from '@/components/imports/opening-importer';
import type { ImportTemplate } from '@/lib/imports/templates';
import { Card, EmptyState } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { IMPORT_TEMPLATES, listImports } from '@/lib/imports';
import { FATE_LABEL } from '@/lib/imports/invitations';
import { formatDate } from '@/lib/dates';

export const metadata: Metadata = { title: 'Import from a spreadsheet' };

/** Moving in from spreadsheets: bulk invitations (and, later, opening records), with the history of imports. */
export default async function ImportsPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'imports:manage');
  const history = await listImports(actor);
  const template = IMPORT_TEMPLATES.invitations(actor.coop.units);
  const slug = actor.coop.slug;
  const opening: { kind: 'opening-balances' | 'opening-tank' | 'opening-supplies' | 'past-batches'; intro: string }[] =
    [
      {
        kind: 'opening-balances',
        intro:
          'What each member owed or held in credit on moving day. Each balance is carried by the member’s next invoice. Invite members first: a balance needs a member who has joined.',
      },
      {
        kind: 'opening-tank',
        intro:
          'The fuel in each tank on moving day and what it cost to make. It becomes the tank’s opening ledger entry, so the tank’s value and the cost-based price of the next draws start from it. Add your tanks on the Tank page first.',
      },
      {
        kind: 'opening-supplies',
        intro:
          'Methanol, catalyst and oil on the shelf on moving day, with what they cost. They become opening lots, so stock, the planner and the cost of the next batches start from them.',
      },
      {
        kind: 'past-batches',
        intro:
          'Your batch history: when each batch was made, oil in, fuel out, what it cost and how it tested. Each becomes a read-only batch marked “Imported summary”, so the cost chart, the quarterly report and the planner’s yield estimate include your past. Their fuel is not added to a tank: import what is in your tanks today as opening tank stock.',
      },
    ];
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1>Import from a spreadsheet</h1>
        <p className="text-stone-600">
          Bring your members, their balances, your tank’s fuel and your batch history over from spreadsheets. You see
          what will happen to every row before anything is saved, every import is in the audit log, and the same file is
          never imported twice. Balances, stock and past batches can be undone as a whole until something is built on
          them.
        </p>
      </div>

      <Card title="Invite members from a CSV file">
        <div className="flex flex-col gap-4">
          <Columns template={template} />
          <p className="text-sm">
            <a href={`/api/coops/${slug}/imports/invitations/template`} download>
              Download the template (CSV)
            </a>
          </p>
          <InvitationImporter coopSlug={slug} fateLabels={FATE_LABEL} />
        </div>
      </Card>

      {opening.map(({ kind, intro }) => {
        const t = IMPORT_TEMPLATES[kind](actor.coop.units);
        return (
          <Card key={kind} title={t.title}>
            <div className="flex flex-col gap-4">
              <p className="text-sm text-stone-700">{intro}</p>
              <Columns template={t} />
              <p className="text-sm">
                <a href={`/api/coops/${slug}/imports/${kind}/template`} download>
                  Download the template (CSV)
                </a>
              </p>
              <OpeningImporter
                coopSlug={slug}
                kind={kind}
                fileColumns={t.columns.map((c) => ({ key: c.key, heading: c.heading }))}
              />
            </div>
          </Card>
        );
      })}

      <section aria-labelledby="history-heading" className="flex flex-col gap-3">
        <h2 id="history-heading">Earlier imports</h2>
        {history.length === 0 ? (
          <EmptyState title="No imports yet">Imports you confirm appear here with their results.</EmptyState>
        ) : (
          <ul className="divide-y divide-stone-100 rounded-xl border border-stone-200 bg-white">
            {history.map((i) => (
              <li key={i.id} className="flex flex-col gap-1 p-3 sm:flex-row sm:items-center sm:justify-between">
                <span>
                  <Link href={`/c/${slug}/imports/${i.kind}/${i.id}`} className="font-medium break-all">
                    {i.fileName}
                  </Link>
                  <span className="block text-sm text-stone-600">
                    {i.kind} · {formatDate(i.createdAt, actor.coop.timezone)}
                    {i.createdBy ? ` · by ${i.createdBy}` : ''}
                    {i.status === 'undone' ? ' · undone' : ''}
                  </span>
                </span>
                <span className="text-sm text-stone-700">
                  {i.rowsImported} imported · {i.rowsSkipped} skipped
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

/** The template's columns, explained. */
function Columns({ template }: { template: ImportTemplate }) {
  return (
    <details className="text-sm text-stone-700">
      <summary className="cursor-pointer font-medium">The columns, explained</summary>
      <dl className="mt-2 grid gap-2">
        {template.columns.map((c) => (
          <div key={c.key}>
            <dt className="inline font-semibold">
              {c.heading}
              {c.required ? ' (required)' : ' (optional)'}:{' '}
            </dt>
            <dd className="inline">{c.explains}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-2">
        Headings may be in any order and any case; extra columns are ignored. Commas, semicolons or tabs between columns
        all work.
      </p>
    </details>
  );
}
