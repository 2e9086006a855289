import type { z } from 'zod';
import type {
  batchCostSchema,
  brewerSectionSchema,
  monthVolumeSchema,
  overviewSchema,
  priceSummarySchema,
  qualityWordingSchema,
  tankSummarySchema,
  treasurerSectionSchema,
} from '@/lib/api/dto/overview';

// The overview's parts: the API's Overview schema is the one definition (lib/api/dto/overview.ts).

export type TankSummary = z.infer<typeof tankSummarySchema>;
export type PriceSummary = z.infer<typeof priceSummarySchema>;
export type MonthVolume = z.infer<typeof monthVolumeSchema>;
export type Overview = z.infer<typeof overviewSchema>;
export type QualityWording = z.infer<typeof qualityWordingSchema>;
export type BrewerSection = z.infer<typeof brewerSectionSchema>;
export type TreasurerSection = z.infer<typeof treasurerSectionSchema>;
export type BatchCost = z.infer<typeof batchCostSchema>;
