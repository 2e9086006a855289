import 'server-only';
import { QueryTypes, type InferAttributes } from 'sequelize';
import { sequelize } from '@/lib/db';
import type { Batch, Draw, TankMovement } from '@/models';

// The reports' statements a model query can't say: per-month aggregates over a calendar made
// with generate_series, each month bounded in the co-op's time zone. Values are always bound.

/** One calendar month of the quarterly report; sums are NUMERIC / BIGINT strings. */
export interface QuarterMonthRow {
  /** YYYY-MM */
  month: string;
  produced: NonNullable<InferAttributes<Batch>['releasedLiters']>;
  released: InferAttributes<TankMovement>['quantityLiters'];
  road: InferAttributes<Draw>['quantityLiters'];
  offRoad: InferAttributes<Draw>['quantityLiters'];
  heating: InferAttributes<Draw>['quantityLiters'];
  roadTax: InferAttributes<Draw>['taxCents'];
  /** Draws less reversing entries. */
  draws: string;
}

/**
 * The three calendar months from `firstMonth` ('YYYY-MM-01'), each bounded by midnight in
 * `timeZone`: litres produced (released_liters of batches released, or imported as made, then), released into tanks
 * (release movements), drawn by declared use with the road tax collected (reversing draws are
 * negative, so they subtract in the month they were entered), and the count of draws net of
 * reversals. Oldest month first; a month with nothing is zeros.
 */
export function quarterMonths(coopId: number, timeZone: string, firstMonth: string): Promise<QuarterMonthRow[]> {
  return sequelize.query<QuarterMonthRow>(
    `WITH months AS (
       SELECT generate_series($start::date, $start::date + interval '2 months', interval '1 month')::date AS m
     ), bounds AS (
       SELECT m, (m::timestamp AT TIME ZONE $tz::text) AS lo, ((m + interval '1 month')::timestamp AT TIME ZONE $tz::text) AS hi FROM months
     ),
     rel AS (
       SELECT b.m, COALESCE(SUM(t.quantity_liters), 0) AS released
       FROM bounds b LEFT JOIN tank_movements t ON t.coop_id = $coopId AND t.kind = 'release' AND t.occurred_at >= b.lo AND t.occurred_at < b.hi
       GROUP BY b.m
     ),
     prod AS (
       SELECT b.m, COALESCE(SUM(x.released_liters), 0) AS produced
       FROM bounds b LEFT JOIN batches x ON x.coop_id = $coopId AND x.status IN ('released', 'imported') AND x.released_at >= b.lo AND x.released_at < b.hi
       GROUP BY b.m
     ),
     dr AS (
       SELECT b.m,
         COALESCE(SUM(d.quantity_liters) FILTER (WHERE d.declared_use = 'road'), 0) AS road,
         COALESCE(SUM(d.quantity_liters) FILTER (WHERE d.declared_use = 'off-road'), 0) AS off_road,
         COALESCE(SUM(d.quantity_liters) FILTER (WHERE d.declared_use = 'heating'), 0) AS heating,
         COALESCE(SUM(d.tax_cents) FILTER (WHERE d.declared_use = 'road'), 0) AS road_tax,
         COUNT(d.id) FILTER (WHERE d.reverses_draw_id IS NULL) - COUNT(d.id) FILTER (WHERE d.reverses_draw_id IS NOT NULL) AS draws
       FROM bounds b LEFT JOIN draws d ON d.coop_id = $coopId AND d.occurred_at >= b.lo AND d.occurred_at < b.hi
       GROUP BY b.m
     )
     SELECT to_char(b.m, 'YYYY-MM') AS month, prod.produced, rel.released, dr.road, dr.off_road AS "offRoad", dr.heating,
            dr.road_tax AS "roadTax", dr.draws
     FROM bounds b JOIN rel ON rel.m = b.m JOIN prod ON prod.m = b.m JOIN dr ON dr.m = b.m ORDER BY b.m`,
    { bind: { coopId, tz: timeZone, start: firstMonth }, type: QueryTypes.SELECT },
  );
}
