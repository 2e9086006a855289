import 'server-only';
import type { z } from 'zod';
import type { quarterlyReportSchema, volumeRowSchema } from '@/lib/api/dto/reports';
import type { Actor } from '@/lib/auth';
import { requireCan } from '@/lib/auth/require';
import { policyInForce } from '@/lib/tank/pricing-policy';
import type { quarterQuerySchema } from '@/lib/validation/reports';
import { quarterMonths } from './queries';

export const REPORT_DISCLAIMER =
  'This report records facts kept in Tallyvat. Road-fuel tax and registration rules vary by country, state and city; ' +
  'ask your co-op’s tax adviser how to file.';

/** One month (or the quarter total) of fuel volumes, in litres (strings, 3 decimals) and cents. */
export type VolumeRow = z.infer<typeof volumeRowSchema>;

/** The report's volume columns, once: CSV name, PDF header and screen label. */
export const VOLUME_COLUMNS: { key: keyof VolumeRow; csv: string; short: string; label: string }[] = [
  { key: 'producedLiters', csv: 'produced', short: 'Produced', label: 'Produced' },
  { key: 'releasedLiters', csv: 'released', short: 'Released', label: 'Released to tanks' },
  { key: 'drawnRoadLiters', csv: 'drawn_road', short: 'Road', label: 'Drawn: road' },
  { key: 'drawnOffRoadLiters', csv: 'drawn_off_road', short: 'Off-road', label: 'Drawn: off-road' },
  { key: 'drawnHeatingLiters', csv: 'drawn_heating', short: 'Heating', label: 'Drawn: heating' },
  { key: 'drawnTotalLiters', csv: 'drawn_total', short: 'Drawn', label: 'Drawn: total' },
];

/** The quarterly report: the API's QuarterlyReport. */
export type QuarterlyReport = z.infer<typeof quarterlyReportSchema>;

/**
 * Fuel produced, released into tanks and drawn by declared use (road / off-road / heating),
 * per month of a calendar quarter in the co-op's time zone, with road-fuel tax collected on
 * road draws. Reversing draws count negatively in the month they were entered. All sums are
 * SQL aggregates ({@link quarterMonths}).
 *
 * Produced = the finished fuel of batches completed in the month: the volume of batches released
 * then (by their release time). A rejected batch records no fuel volume (the batches table keeps
 * released_liters for released batches only), so it adds nothing. Past batches imported in
 * summary count as produced in the month of their date (released_at is that day): they were made
 * then, though their fuel never entered a tank here. "Released" is every release movement into a
 * tank, so the two differ when fuel enters a tank other than from a batch record (or was imported).
 */
export async function getQuarterlyReport(
  actor: Actor,
  q: z.infer<typeof quarterQuerySchema>,
): Promise<QuarterlyReport> {
  requireCan(actor, 'reports:read');
  const startMonth = (q.quarter - 1) * 3 + 1;
  const start = `${q.year}-${String(startMonth).padStart(2, '0')}-01`;
  const [rows, policy] = await Promise.all([
    quarterMonths(actor.coop.id, actor.coop.timezone, start),
    policyInForce(actor.coop.id),
  ]);
  const months = rows.map<VolumeRow>((r) => ({
    period: r.month,
    producedLiters: fixed(r.produced),
    releasedLiters: fixed(r.released),
    drawnRoadLiters: fixed(r.road),
    drawnOffRoadLiters: fixed(r.offRoad),
    drawnHeatingLiters: fixed(r.heating),
    drawnTotalLiters: fixed(Number(r.road) + Number(r.offRoad) + Number(r.heating)),
    roadTaxCents: Number(r.roadTax),
    draws: Number(r.draws),
  }));
  const sum = (k: keyof VolumeRow) => fixed(months.reduce((a, m) => a + Math.round(Number(m[k]) * 1000), 0) / 1000);
  const total: VolumeRow = {
    period: `${q.year} Q${q.quarter}`,
    producedLiters: sum('producedLiters'),
    releasedLiters: sum('releasedLiters'),
    drawnRoadLiters: sum('drawnRoadLiters'),
    drawnOffRoadLiters: sum('drawnOffRoadLiters'),
    drawnHeatingLiters: sum('drawnHeatingLiters'),
    drawnTotalLiters: sum('drawnTotalLiters'),
    roadTaxCents: months.reduce((a, m) => a + m.roadTaxCents, 0),
    draws: months.reduce((a, m) => a + m.draws, 0),
  };
  return {
    coop: { name: actor.coop.name, units: actor.coop.units, timezone: actor.coop.timezone },
    year: q.year,
    quarter: q.quarter,
    months,
    total,
    roadTaxCentsPerGallon:
      policy && Number(policy.road_tax_cents_per_gallon) > 0 ? String(policy.road_tax_cents_per_gallon) : null,
    disclaimer: REPORT_DISCLAIMER,
  };
}

const fixed = (v: string | number) => Number(v).toFixed(3);
