import 'server-only';
import type { z } from 'zod';
import type { importPreviewSchema, importResultSchema } from '@/lib/api/dto/imports';
import type { Actor } from '@/lib/auth';
import { csvRows } from '@/lib/csv';
import { notFound } from '@/lib/http';
import { importKindSchema, type ImportFileInput, type ImportKindName } from '@/lib/validation/imports';
import { confirmInvitationImport, INVITATION_COLUMNS, previewInvitationImport, RESULT_LABEL } from './invitations';
import { IMPORT_TEMPLATES, type ImportTemplate } from './templates';
import { openingBalances, undoOpeningBalances } from './balances';
import { openingSupplies, undoOpeningSupplies } from './supplies-stock';
import { openingTankStock, undoOpeningTankStock } from './tank-stock';
import { pastBatches, undoPastBatches } from './past-batches';
import { confirmOpening, previewOpening, type OpeningKind } from './opening';
import { undoImport, type UndoRows } from './undo';

export {
  getImport,
  importResultCsv,
  listImports,
  type ImportDetail,
  type ImportDto,
  type ImportRowDto,
} from './history';
export { IMPORT_TEMPLATES, type ImportTemplate };

/** What one kind of import can do: preview (writes nothing), confirm (one transaction), name its fates. */
interface Importer {
  preview(actor: Actor, input: ImportFileInput): Promise<z.infer<typeof importPreviewSchema>>;
  confirm(actor: Actor, input: ImportFileInput): Promise<z.infer<typeof importResultSchema>>;
  fateLabel(fate: string): string;
  /** The file's columns in order, for the result download. */
  columns: readonly { key: string; heading: string }[];
  /** Removes what the import wrote (absent: cannot be undone). */
  undo?: UndoRows;
}

const OPENING_FATES: Record<string, string> = { imported: 'Imported' };

/** An opening-records importer from its spec. */
function opening<K extends string, P>(spec: OpeningKind<K, P>, undo: UndoRows): Importer {
  return {
    preview: (actor, input) => previewOpening(actor, spec, input),
    confirm: (actor, input) => confirmOpening(actor, spec, input),
    fateLabel: (f) => OPENING_FATES[f] ?? f,
    columns: spec.columns.map((c) => ({ key: c.key, heading: c.headings[0] ?? c.key })),
    undo,
  };
}

const IMPORTERS: Record<ImportKindName, Importer> = {
  invitations: {
    preview: previewInvitationImport,
    confirm: confirmInvitationImport,
    fateLabel: (f) => RESULT_LABEL[f as keyof typeof RESULT_LABEL] ?? f,
    columns: INVITATION_COLUMNS.map((c) => ({ key: c.key, heading: c.headings[0] })),
  },
  'opening-balances': opening(openingBalances, (actor, ids, t) => undoOpeningBalances(actor.coop.id, ids, t)),
  'opening-tank': opening(openingTankStock, undoOpeningTankStock),
  'opening-supplies': opening(openingSupplies, undoOpeningSupplies),
  'past-batches': opening(pastBatches, undoPastBatches),
};

/** Undoes an import as a whole (see lib/imports/undo.ts). */
export function undoImportOf(actor: Actor, kind: ImportKindName, importer: Importer, id: number) {
  return undoImport(actor, kind, id, importer.undo);
}

/** The importer for a kind in the URL; an unknown kind is a 404. */
export function importerFor(kind: string | undefined): { kind: ImportKindName; importer: Importer } {
  const parsed = importKindSchema.safeParse(kind);
  if (!parsed.success) throw notFound('There is no such import.');
  return { kind: parsed.data, importer: IMPORTERS[parsed.data] };
}

/** The kind's CSV template: its headings and an example row, in the co-op's units and date format. */
export function importTemplateCsv(actor: Actor, kind: ImportKindName): { fileName: string; body: string } {
  const t: ImportTemplate = IMPORT_TEMPLATES[kind](actor.coop.units);
  return { fileName: `tallyvat-${kind}-template.csv`, body: csvRows([t.columns.map((c) => c.heading), ...t.examples]) };
}
