import 'server-only';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { requireCan } from '@/lib/auth/require';
import { notFound, invalidFields } from '@/lib/http';
import { MAX_ELEVATION_M, MIN_ELEVATION_M } from '@/lib/chemistry';
import type { CoopSettingsUpdate } from '@/lib/validation/settings';
import { inTransaction } from '@/lib/db';
import { Coop } from '@/models';
import type { CoopSettings } from '@/models/Coop';
import type { CoopSettingsDto } from './settings-types';

export type { CoopSettingsDto };

/** Metres in one international foot, exact by definition (NIST SP 811). */
const FEET_TO_METERS = 0.3048;

/** Recipe defaults when a co-op has set none: NaOH 3.5 g/L fresh-oil base, 20 % methanol (common practice). */
const DEFAULTS = {
  catalyst: 'NaOH',
  baseGramsPerLiter: 3.5,
  purityPct: 98,
  methanolPct: 20,
  qualityStandard: 'ASTM D6751',
} as const;

function toDto(c: Coop): CoopSettingsDto {
  const s: CoopSettings = c.settings ?? {};
  return {
    name: c.name,
    slug: c.slug,
    units: c.units,
    timezone: c.timezone,
    currency: c.currency,
    monthlyDuesCents: s.monthlyDuesCents ?? 0,
    selfServeDraws: s.selfServeDraws ?? false,
    catalyst: s.recipe?.catalyst ?? DEFAULTS.catalyst,
    baseGramsPerLiter: s.recipe?.baseGramsPerLiter ?? DEFAULTS.baseGramsPerLiter,
    purityPct: s.recipe?.purityPct ?? DEFAULTS.purityPct,
    methanolPct: s.recipe?.methanolPct ?? DEFAULTS.methanolPct,
    qualityStandard: s.qualityStandard ?? DEFAULTS.qualityStandard,
    elevationM: s.elevationM ?? 0,
  };
}

export async function getCoopSettings(actor: Actor): Promise<CoopSettingsDto> {
  requireCan(actor, 'settings:manage');
  const coop = await Coop.findByPk(actor.coop.id);
  if (!coop) throw notFound();
  return toDto(coop);
}

/** Updates the co-op's settings (admins); audited with before and after. Units change only how figures are shown. */
export async function updateCoopSettings(actor: Actor, input: CoopSettingsUpdate): Promise<CoopSettingsDto> {
  requireCan(actor, 'settings:manage');
  return inTransaction(async (transaction) => {
    const coop = await Coop.findByPk(actor.coop.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!coop) throw notFound();
    const before = toDto(coop);
    const elevationM =
      input.elevation === undefined
        ? undefined
        : input.units === 'us'
          ? input.elevation * FEET_TO_METERS
          : input.elevation;
    if (elevationM !== undefined && (elevationM < MIN_ELEVATION_M || elevationM > MAX_ELEVATION_M)) {
      throw invalidFields({
        elevation: [input.units === 'us' ? 'Between −1,640 and 16,400 ft.' : 'Between −500 and 5,000 m.'],
      });
    }
    const settings: CoopSettings = {
      ...(coop.settings ?? {}),
      monthlyDuesCents: input.monthlyDues,
      selfServeDraws: input.selfServeDraws,
      qualityStandard: input.qualityStandard,
      ...(elevationM === undefined ? {} : { elevationM }),
      recipe: {
        ...(coop.settings?.recipe ?? {}),
        catalyst: input.catalyst,
        baseGramsPerLiter: input.baseGramsPerLiter,
        purityPct: input.purityPct,
        methanolPct: input.methanolPct,
      },
    };
    await coop.update({ name: input.name, units: input.units, timezone: input.timezone, settings }, { transaction });
    const after = toDto(coop);
    await audit(
      {
        coopId: coop.id,
        actorUserId: actor.user.id,
        action: 'coop.settings',
        entityType: 'coop',
        entityId: coop.id,
        before,
        after,
      },
      transaction,
    );
    return after;
  });
}
