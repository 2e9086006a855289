import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { ImportResult } from '@/components/imports/import-result';
import { requirePageActor } from '@/lib/auth';
import { getImport, IMPORT_TEMPLATES } from '@/lib/imports';
import { OpeningResult } from '@/components/imports/opening-result';
import { RESULT_LABEL } from '@/lib/imports/invitations';
import { HttpError } from '@/lib/http';
import { toId } from '@/lib/validation/common';
import { importKindSchema } from '@/lib/validation/imports';
import { formatDate } from '@/lib/dates';

export const metadata: Metadata = { title: 'Import result' };

/** One import: every row's fate and, for invitations, each e-mail as the worker sends it. */
export default async function ImportResultPage({
  params,
}: {
  params: Promise<{ coop: string; kind: string; id: string }>;
}) {
  const { coop, kind, id } = await params;
  const actor = await requirePageActor(coop, 'imports:manage');
  const k = importKindSchema.safeParse(kind);
  const importId = toId(id);
  if (!k.success || importId === null) notFound();
  const detail = await getImport(actor, k.data, importId).catch((e: unknown) =>
    e instanceof HttpError && e.status === 404 ? null : Promise.reject(e),
  );
  if (!detail) notFound();
  const slug = actor.coop.slug;
  const template = IMPORT_TEMPLATES[k.data](actor.coop.units);
  return (
    <div className="flex flex-col gap-5">
      <div>
        <p className="text-sm">
          <Link href={`/c/${slug}/imports`}>← Imports</Link>
        </p>
        <h1 className="break-all">
          {template.title} from {detail.import.fileName}
        </h1>
        <p className="text-stone-600">
          Imported {formatDate(detail.import.createdAt, actor.coop.timezone)}
          {detail.import.createdBy ? ` by ${detail.import.createdBy}` : ''}: {detail.import.rowsImported} imported,{' '}
          {detail.import.rowsSkipped} skipped of {detail.import.rowsTotal} rows.
          {detail.import.undoneAt ? ` Undone ${formatDate(detail.import.undoneAt, actor.coop.timezone)}.` : ''}
        </p>
      </div>
      {k.data === 'invitations' ? (
        <ImportResult coopSlug={slug} kind={k.data} initial={detail} fateLabels={RESULT_LABEL} />
      ) : (
        <OpeningResult
          coopSlug={slug}
          kind={k.data}
          importId={detail.import.id}
          undone={detail.import.status === 'undone'}
          fileColumns={template.columns.map((c) => ({ key: c.key, heading: c.heading }))}
          rows={detail.rows.map((r) => ({ line: r.line, values: r.values, errors: [], note: r.values.message ?? '' }))}
        />
      )}
    </div>
  );
}
