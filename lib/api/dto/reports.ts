import { z } from 'zod';
import { int, str, units } from './common';

// The quarterly fuel-volume report as the API sends it; lib/reports' types are inferred from
// these (one definition).

const litres = () => str().describe('Litres, 3 decimals (a decimal string: exact)');

export const volumeRowSchema = z.object({
  period: str().describe('YYYY-MM for a month, "YYYY Qn" for the quarter total'),
  producedLiters: litres(),
  releasedLiters: litres(),
  drawnRoadLiters: litres(),
  drawnOffRoadLiters: litres(),
  drawnHeatingLiters: litres(),
  drawnTotalLiters: litres(),
  roadTaxCents: int().describe('Road-fuel tax collected on road draws'),
  draws: int(),
});

export const quarterlyReportSchema = z
  .object({
    coop: z.object({ name: str(), units, timezone: str() }),
    year: int(),
    quarter: int(),
    months: z.array(volumeRowSchema),
    total: volumeRowSchema,
    roadTaxCentsPerGallon: str().nullable().describe('The rate of the price policy in force; null when none'),
    disclaimer: str(),
  })
  .meta({ id: 'QuarterlyReport', description: 'Fuel produced, released and drawn by declared use, per month.' });
