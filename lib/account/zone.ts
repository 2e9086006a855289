import 'server-only';
import { Coop, Membership } from '@/models';

/**
 * The time zone a person's own e-mails (password reset, e-mail change) speak in: their co-op's,
 * the earliest-joined active membership's when they have several; UTC when they belong to none.
 */
export async function personTimeZone(userId: number): Promise<string> {
  const m = (await Membership.findOne({
    where: { userId, status: 'active' },
    attributes: ['id'],
    include: [{ model: Coop, as: 'coop', required: true, attributes: ['timezone'] }],
    order: [
      ['joinedAt', 'ASC'],
      ['id', 'ASC'],
    ],
    raw: true,
    nest: true,
  })) as unknown as { coop: { timezone: string } } | null;
  return m?.coop.timezone ?? 'UTC';
}
