import 'server-only';
import { col, fn, Op, UniqueConstraintError, where } from 'sequelize';
import type { z } from 'zod';
import type {
  invitationFate,
  invitationImportPreviewSchema,
  invitationImportResultSchema,
  invitationPreviewRowSchema,
} from '@/lib/api/dto/imports';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { ROLES, type Role } from '@/lib/auth/roles';
import { INVITATION_TTL_MS, newLinkToken } from '@/lib/auth/tokens';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError } from '@/lib/http';
import { enqueueInvitationMails } from '@/lib/members/invitations/deliver';
import { emailSchema, nameSchema } from '@/lib/validation/auth';
import type { ImportFileInput } from '@/lib/validation/imports';
import { Import, Invitation, Membership } from '@/models';
import type { ImportRowRecord } from '@/models/Import';
import { csvFileHash, readCsv, type CsvRow } from './csv-read';
import { assertNotImportedYet, earlierImportOf } from './history';

/** The columns of an invitations file (name is optional; a blank role means member). */
export const INVITATION_COLUMNS = [
  { key: 'name', headings: ['Name', 'Full name', 'Member'], required: false },
  { key: 'email', headings: ['E-mail', 'Email', 'Email address', 'E-mail address', 'Mail'], required: true },
  { key: 'role', headings: ['Role'], required: false },
] as const;
type Key = (typeof INVITATION_COLUMNS)[number]['key'];

/** What happens to one row. Only `invite` rows become invitations. */
export type InvitationFate = z.infer<typeof invitationFate>;

export const FATE_LABEL: Record<InvitationFate, string> = {
  invite: 'Will invite',
  member: 'Already a member',
  invited: 'Already invited',
  duplicate: 'Duplicate in file',
  'bad-email': 'Bad e-mail',
  'bad-role': 'Unknown role',
  'bad-name': 'Bad name',
};

/** The same fates once the import is done (the result page and download). */
export const RESULT_LABEL: Record<InvitationFate, string> = { ...FATE_LABEL, invite: 'Invited' };

/** One row of the file and its fate: the API's shape (one definition). */
export type InvitationPreviewRow = z.infer<typeof invitationPreviewRowSchema>;

/** Each row's fate if the file were imported now, and whether this very file was imported before. */
export type InvitationPreview = z.infer<typeof invitationImportPreviewSchema>;

/** What the co-op already has for the addresses in the file: members, and pending invitations (expired or not). */
interface Known {
  members: Set<string>;
  pending: Map<string, { id: number; expired: boolean }>;
}

/** Decides each row's fate (pure, given what the co-op already has). Duplicates point at the first row. */
export function classifyInvitationRows(rows: CsvRow<Key>[], known: Known): InvitationPreviewRow[] {
  const firstLine = new Map<string, number>();
  return rows.map(({ line, cells }) => {
    const base = { line, name: cells.name, email: cells.email, role: cells.role };
    const email = emailSchema.safeParse(cells.email);
    if (!email.success)
      return {
        ...base,
        fate: 'bad-email',
        field: 'email',
        message: cells.email ? `"${cells.email}" is not an e-mail address.` : 'The e-mail is empty.',
      };
    const address = email.data;
    const role = (cells.role.trim().toLowerCase() || 'member') as Role;
    if (!ROLES.includes(role))
      return {
        ...base,
        email: address,
        fate: 'bad-role',
        field: 'role',
        message: `"${cells.role}" is not a role. Use one of: ${ROLES.join(', ')}.`,
      };
    if (cells.name !== '' && !nameSchema.safeParse(cells.name).success) {
      return {
        ...base,
        email: address,
        role,
        fate: 'bad-name',
        field: 'name',
        message: 'The name is too long (at most 120 characters) or has control characters.',
      };
    }
    const out = { ...base, email: address, role };
    const first = firstLine.get(address);
    if (first !== undefined)
      return {
        ...out,
        fate: 'duplicate',
        field: 'email',
        message: `Same e-mail as row ${first}; only row ${first} counts.`,
      };
    firstLine.set(address, line);
    if (known.members.has(address))
      return { ...out, fate: 'member', field: null, message: 'Already a member of this co-op.' };
    const pending = known.pending.get(address);
    if (pending && !pending.expired)
      return { ...out, fate: 'invited', field: null, message: 'An invitation is already waiting to be accepted.' };
    return {
      ...out,
      fate: 'invite',
      field: null,
      message: pending ? 'Will invite (renews an expired invitation).' : 'Will invite.',
    };
  });
}

function countFates(rows: InvitationPreviewRow[]): Record<InvitationFate, number> {
  const counts = Object.fromEntries(Object.keys(FATE_LABEL).map((k) => [k, 0])) as Record<InvitationFate, number>;
  for (const r of rows) counts[r.fate]++;
  return counts;
}

/** The addresses of the file that are members or have pending invitations (one query each, by lower(email)). */
async function knownFor(actor: Actor, emails: string[], transaction?: import('sequelize').Transaction): Promise<Known> {
  if (emails.length === 0) return { members: new Set(), pending: new Map() };
  // One after the other: inside a transaction they share one connection.
  const members = await Membership.findAll({
    attributes: ['id'],
    where: { coopId: actor.coop.id },
    include: [
      {
        association: 'user',
        attributes: ['email'],
        required: true,
        where: where(fn('lower', col('user.email')), { [Op.in]: emails }),
      },
    ],
    transaction,
  });
  const pending = await Invitation.findAll({
    attributes: ['id', 'email', 'expiresAt'],
    where: {
      coopId: actor.coop.id,
      status: 'pending',
      [Op.and]: [where(fn('lower', col('email')), { [Op.in]: emails })],
    },
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  return {
    members: new Set(members.map((m) => m.user!.email.toLowerCase())),
    pending: new Map(
      pending.map((p) => [p.email.toLowerCase(), { id: p.id, expired: p.expiresAt.getTime() <= Date.now() }]),
    ),
  };
}

function parse(input: ImportFileInput): { rows: CsvRow<Key>[]; ignoredHeadings: string[] } {
  const read = readCsv(input.csv, INVITATION_COLUMNS);
  if (!read.ok) throw new HttpError(422, read.error, { csv: [read.error] });
  return { rows: read.rows, ignoredHeadings: read.ignoredHeadings };
}

const validEmails = (rows: CsvRow<Key>[]) => [
  ...new Set(rows.map((r) => emailSchema.safeParse(r.cells.email)).flatMap((r) => (r.success ? [r.data] : []))),
];

/** Each row's fate if the file were imported now. Writes nothing. */
export async function previewInvitationImport(actor: Actor, input: ImportFileInput): Promise<InvitationPreview> {
  const { rows, ignoredHeadings } = parse(input);
  const fileHash = csvFileHash(input.csv);
  const [known, earlierImport] = await Promise.all([
    knownFor(actor, validEmails(rows)),
    earlierImportOf(actor, 'invitations', fileHash),
  ]);
  const decided = classifyInvitationRows(rows, known);
  return {
    fileName: input.fileName,
    fileHash,
    rows: decided,
    counts: countFates(decided),
    ignoredHeadings,
    earlierImport,
  };
}

/**
 * Imports the file: one transaction re-decides every row against the co-op as it is now, creates
 * (or renews) an invitation for each `invite` row, queues one e-mail job per invitation (sent by
 * the worker, exactly once each), and records the import with every row's fate. The same file a
 * second time is a 409; a file that would invite nobody is a 422 and records nothing.
 */
export async function confirmInvitationImport(
  actor: Actor,
  input: ImportFileInput,
): Promise<z.infer<typeof invitationImportResultSchema>> {
  const { rows } = parse(input);
  const fileHash = csvFileHash(input.csv);
  try {
    return await inTransaction(async (transaction) => {
      await assertNotImportedYet(actor, 'invitations', fileHash, transaction);
      const known = await knownFor(actor, validEmails(rows), transaction);
      const decided = classifyInvitationRows(rows, known);
      const toInvite = decided.filter((r) => r.fate === 'invite');
      if (toInvite.length === 0) {
        throw new HttpError(
          422,
          'No row of this file would invite anyone: everyone in it is a member, already invited, or has an error.',
          {
            csv: ['Nothing to invite.'],
          },
        );
      }
      const record = await Import.create(
        {
          coopId: actor.coop.id,
          kind: 'invitations',
          fileName: input.fileName,
          fileHash,
          rowsTotal: decided.length,
          rowsImported: toInvite.length,
          rowsSkipped: decided.length - toInvite.length,
          createdByUserId: actor.user.id,
          undoneByUserId: null,
        },
        { transaction },
      );
      const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
      const ids = new Map<number, number>();
      const fresh = toInvite.filter((r) => !known.pending.has(r.email));
      const created = await Invitation.bulkCreate(
        fresh.map((r) => ({
          coopId: actor.coop.id,
          email: r.email,
          name: r.name || null,
          role: r.role as Role,
          tokenHash: newLinkToken().hash,
          delivery: 'queued' as const,
          importId: record.id,
          invitedByUserId: actor.user.id,
          expiresAt,
          acceptedAt: null,
        })),
        { transaction, returning: ['id'] },
      );
      fresh.forEach((r, i) => ids.set(r.line, created[i]!.id));
      for (const r of toInvite.filter((x) => known.pending.has(x.email))) {
        // An expired invitation to this address: renewed in place with the file's role and name.
        const id = known.pending.get(r.email)!.id;
        await Invitation.update(
          {
            role: r.role as Role,
            name: r.name || null,
            tokenHash: newLinkToken().hash,
            expiresAt,
            delivery: 'queued',
            importId: record.id,
            invitedByUserId: actor.user.id,
          },
          { where: { id, coopId: actor.coop.id }, transaction },
        );
        ids.set(r.line, id);
      }
      const records: ImportRowRecord[] = decided.map((r) => ({
        line: r.line,
        fate: r.fate,
        values: { name: r.name, email: r.email, role: r.role, message: r.message },
        entityId: ids.get(r.line) ?? null,
      }));
      await record.update({ rows: records }, { transaction });
      await enqueueInvitationMails(actor.coop.id, [...ids.values()], transaction, true);
      await audit(
        {
          coopId: actor.coop.id,
          actorUserId: actor.user.id,
          action: 'import.create',
          entityType: 'import',
          entityId: record.id,
          before: null,
          after: {
            kind: 'invitations',
            fileName: input.fileName,
            fileHash,
            rowsTotal: decided.length,
            rowsImported: toInvite.length,
            rowsSkipped: decided.length - toInvite.length,
          },
        },
        transaction,
      );
      return { importId: record.id, invited: toInvite.length, skipped: decided.length - toInvite.length };
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) {
      throw conflict(
        'Someone invited one of these addresses, or imported this file, a moment ago. Preview the file again.',
      );
    }
    throw e;
  }
}
