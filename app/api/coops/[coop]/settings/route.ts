import { requireMember } from '@/lib/auth';
import { getCoopSettings, updateCoopSettings } from '@/lib/coops/settings';
import { handler, parseBody } from '@/lib/http';
import { coopSettingsUpdateSchema } from '@/lib/validation/settings';

export const dynamic = 'force-dynamic';

/** GET / PUT the co-op's settings (admins): name, units, time zone, dues, self-serve draws, recipe defaults, quality standard. */
export const GET = handler<{ coop: string }>(async (_req, { coop }) =>
  getCoopSettings(await requireMember(coop, 'settings:manage')),
);

export const PUT = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'settings:manage');
  return updateCoopSettings(actor, await parseBody(req, coopSettingsUpdateSchema));
});
