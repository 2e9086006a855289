/** What the settings form shows. */
export interface CoopSettingsDto {
  name: string;
  slug: string;
  units: 'us' | 'metric';
  timezone: string;
  currency: string;
  monthlyDuesCents: number;
  selfServeDraws: boolean;
  catalyst: 'KOH' | 'NaOH';
  baseGramsPerLiter: number;
  purityPct: number;
  methanolPct: number;
  qualityStandard: 'ASTM D6751' | 'EN 14214';
}
