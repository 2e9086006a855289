import 'server-only';
import { UniqueConstraintError } from 'sequelize';
import { audit } from '@/lib/audit';
import type { SessionUser } from '@/lib/auth';
import { invalidFields } from '@/lib/http';
import type { z } from 'zod';
import type { coopCreatedSchema } from '@/lib/api/dto/core';
import type { coopCreateSchema } from '@/lib/validation/auth';
import { inTransaction } from '@/lib/db';
import { Coop, Membership } from '@/models';

/** Creates a co-op with its creator as the first admin (one transaction). */
export async function createCoop(
  user: SessionUser,
  input: z.infer<typeof coopCreateSchema>,
): Promise<z.infer<typeof coopCreatedSchema>> {
  try {
    return await inTransaction(async (transaction) => {
      const coop = await Coop.create(
        { name: input.name, slug: input.slug, units: input.units, timezone: input.timezone },
        { transaction },
      );
      await Membership.create({ coopId: coop.id, userId: user.id, role: 'admin' }, { transaction });
      await audit(
        {
          coopId: coop.id,
          actorUserId: user.id,
          action: 'coop.create',
          entityType: 'coop',
          entityId: coop.id,
          after: { name: coop.name, slug: coop.slug, units: coop.units },
        },
        transaction,
      );
      return { id: coop.id, slug: coop.slug, name: coop.name };
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw invalidFields({ slug: ['That web address is taken.'] });
    throw e;
  }
}
