import type { InferAttributes } from 'sequelize';
import type { Coop, CoopSettings } from '@/models/Coop';

type Recipe = NonNullable<CoopSettings['recipe']>;

/** What the settings form shows: the co-op's columns plus its settings with defaults filled in. */
export type CoopSettingsDto = Pick<InferAttributes<Coop>, 'name' | 'slug' | 'units' | 'timezone' | 'currency'> & {
  monthlyDuesCents: number;
  selfServeDraws: boolean;
  catalyst: NonNullable<Recipe['catalyst']>;
  baseGramsPerLiter: number;
  purityPct: number;
  methanolPct: number;
  qualityStandard: NonNullable<CoopSettings['qualityStandard']>;
  /** Elevation of the brewing site, m (0 when not set). */
  elevationM: number;
};
