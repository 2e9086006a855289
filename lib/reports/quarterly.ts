import 'server-only';
import { QueryTypes } from 'sequelize';
import type { z } from 'zod';
import type { Actor } from '@/lib/auth';
import { requireCan } from '@/lib/auth/require';
import { sequelize } from '@/lib/db';
import { policyInForce } from '@/lib/pricing-policy';
import type { quarterQuerySchema } from '@/lib/validation/reports';

export const REPORT_DISCLAIMER =
  'This report records facts kept in Tallyvat. Road-fuel tax and registration rules vary by country, state and city; ' +
  'ask your co-op’s tax adviser how to file.';

/** One month (or the quarter total) of fuel volumes, in litres (strings, 3 decimals) and cents. */
export interface VolumeRow {
  period: string;
  producedLiters: string;
  releasedLiters: string;
  drawnRoadLiters: string;
  drawnOffRoadLiters: string;
  drawnHeatingLiters: string;
  drawnTotalLiters: string;
  roadTaxCents: number;
  draws: number;
}

/** The report's volume columns, once: CSV name, PDF header and screen label. */
export const VOLUME_COLUMNS: { key: keyof VolumeRow; csv: string; short: string; label: string }[] = [
  { key: 'producedLiters', csv: 'produced', short: 'Produced', label: 'Produced' },
  { key: 'releasedLiters', csv: 'released', short: 'Released', label: 'Released to tanks' },
  { key: 'drawnRoadLiters', csv: 'drawn_road', short: 'Road', label: 'Drawn: road' },
  { key: 'drawnOffRoadLiters', csv: 'drawn_off_road', short: 'Off-road', label: 'Drawn: off-road' },
  { key: 'drawnHeatingLiters', csv: 'drawn_heating', short: 'Heating', label: 'Drawn: heating' },
  { key: 'drawnTotalLiters', csv: 'drawn_total', short: 'Drawn', label: 'Drawn: total' },
];

export interface QuarterlyReport {
  coop: { name: string; units: 'us' | 'metric'; timezone: string };
  year: number;
  quarter: number;
  months: VolumeRow[];
  total: VolumeRow;
  roadTaxCentsPerGallon: string | null;
  disclaimer: string;
}

/**
 * Fuel produced, released into tanks and drawn by declared use (road / off-road / heating),
 * per month of a calendar quarter in the co-op's time zone, with road-fuel tax collected on
 * road draws. Reversing draws count negatively in the month they were entered. All sums are
 * SQL aggregates.
 */
export async function getQuarterlyReport(actor: Actor, q: z.infer<typeof quarterQuerySchema>): Promise<QuarterlyReport> {
  requireCan(actor, 'reports:read');
  const startMonth = (q.quarter - 1) * 3 + 1;
  const start = `${q.year}-${String(startMonth).padStart(2, '0')}-01`;
  const rows = await sequelize.query<{
    month: string; produced: string; released: string; road: string; off_road: string; heating: string; road_tax: string; draws: string;
  }>(
    `WITH months AS (
       SELECT generate_series(CAST(:start AS date), CAST(:start AS date) + interval '2 months', interval '1 month')::date AS m
     ), bounds AS (
       SELECT m, (m::timestamp AT TIME ZONE :tz) AS lo, ((m + interval '1 month')::timestamp AT TIME ZONE :tz) AS hi FROM months
     ),
     rel AS (
       SELECT b.m, COALESCE(SUM(t.quantity_liters), 0) AS released
       FROM bounds b LEFT JOIN tank_movements t ON t.coop_id = :coopId AND t.kind = 'release' AND t.occurred_at >= b.lo AND t.occurred_at < b.hi
       GROUP BY b.m
     ),
     prod AS (
       SELECT b.m, COALESCE(SUM(x.released_liters), 0) AS produced
       FROM bounds b LEFT JOIN batches x ON x.coop_id = :coopId AND x.status = 'released' AND x.released_at >= b.lo AND x.released_at < b.hi
       GROUP BY b.m
     ),
     dr AS (
       SELECT b.m,
         COALESCE(SUM(d.quantity_liters) FILTER (WHERE d.declared_use = 'road'), 0) AS road,
         COALESCE(SUM(d.quantity_liters) FILTER (WHERE d.declared_use = 'off-road'), 0) AS off_road,
         COALESCE(SUM(d.quantity_liters) FILTER (WHERE d.declared_use = 'heating'), 0) AS heating,
         COALESCE(SUM(d.tax_cents) FILTER (WHERE d.declared_use = 'road'), 0) AS road_tax,
         COUNT(d.id) FILTER (WHERE d.reverses_draw_id IS NULL) - COUNT(d.id) FILTER (WHERE d.reverses_draw_id IS NOT NULL) AS draws
       FROM bounds b LEFT JOIN draws d ON d.coop_id = :coopId AND d.occurred_at >= b.lo AND d.occurred_at < b.hi
       GROUP BY b.m
     )
     SELECT to_char(b.m, 'YYYY-MM') AS month, ${PRODUCED_SQL} AS produced, rel.released, dr.road, dr.off_road, dr.heating, dr.road_tax, dr.draws
     FROM bounds b JOIN rel ON rel.m = b.m JOIN prod ON prod.m = b.m JOIN dr ON dr.m = b.m ORDER BY b.m`,
    { replacements: { coopId: actor.coop.id, tz: actor.coop.timezone, start }, type: QueryTypes.SELECT },
  );
  const months = rows.map<VolumeRow>((r) => ({
    period: r.month,
    producedLiters: fixed(r.produced),
    releasedLiters: fixed(r.released),
    drawnRoadLiters: fixed(r.road),
    drawnOffRoadLiters: fixed(r.off_road),
    drawnHeatingLiters: fixed(r.heating),
    drawnTotalLiters: fixed(Number(r.road) + Number(r.off_road) + Number(r.heating)),
    roadTaxCents: Number(r.road_tax),
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
  const policy = await policyInForce(actor.coop.id);
  return {
    coop: { name: actor.coop.name, units: actor.coop.units, timezone: actor.coop.timezone },
    year: q.year,
    quarter: q.quarter,
    months,
    total,
    roadTaxCentsPerGallon: policy && Number(policy.road_tax_cents_per_gallon) > 0 ? String(policy.road_tax_cents_per_gallon) : null,
    disclaimer: REPORT_DISCLAIMER,
  };
}

/**
 * Produced = the finished fuel of batches completed in the month: the volume of batches released
 * then (by their release time). A rejected batch records no fuel volume (the batches table keeps
 * released_liters for released batches only), so it adds nothing. "Released" is every release
 * movement into a tank, so the two differ when fuel enters a tank other than from a batch record.
 */
const PRODUCED_SQL = 'prod.produced';

const fixed = (v: string | number) => Number(v).toFixed(3);
