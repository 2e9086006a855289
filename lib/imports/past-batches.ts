import 'server-only';
import { Op, type Transaction } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { todayIn, formatDate } from '@/lib/dates';
import { batchCost } from '@/lib/costing';
import { conflict } from '@/lib/http';
import { formatCents, roundHalfUp } from '@/lib/money';
import { mlToLiters } from '@/lib/units/quantity';
import { formatMl, milliUnitsToMl, mlToUnits } from '@/lib/tank/volume';
import { litersToGallons } from '@/lib/units';
import { Batch } from '@/models';
import type { CsvRow } from './csv-read';
import { rowChecker, type Checked, type OpeningKind } from './opening';
import { readDate, readMoneyCents, readQuantity, toMilli } from './values';

const COLUMNS = [
  { key: 'number', headings: ['Batch number', 'Batch', 'Number', 'No', '#'], required: false },
  { key: 'date', headings: ['Date', 'Batch date', 'Made on'], required: true },
  {
    key: 'oil',
    headings: ['Oil in', 'Oil in (gallons)', 'Oil in (litres)', 'Oil in (liters)', 'Oil', 'Oil gallons', 'Oil litres'],
    required: true,
  },
  {
    key: 'fuel',
    headings: ['Fuel out', 'Fuel out (gallons)', 'Fuel out (litres)', 'Fuel out (liters)', 'Fuel', 'Biodiesel'],
    required: true,
  },
  {
    key: 'costPerUnit',
    headings: ['Cost per gallon', 'Cost per litre', 'Cost per liter', 'Unit cost'],
    required: false,
  },
  { key: 'oilCost', headings: ['Oil cost', 'Feedstock cost'], required: false },
  { key: 'methanolCost', headings: ['Methanol cost'], required: false },
  { key: 'catalystCost', headings: ['Catalyst cost', 'Lye cost'], required: false },
  { key: 'energyCost', headings: ['Energy cost', 'Power cost'], required: false },
  { key: 'otherCost', headings: ['Other cost', 'Other costs'], required: false },
  { key: 'verdict', headings: ['Quality', 'Verdict', 'Quality verdict'], required: false },
  { key: 'notes', headings: ['Notes', 'Quality notes'], required: false },
] as const;
type Key = (typeof COLUMNS)[number]['key'];
const INPUT_COSTS = ['oilCost', 'methanolCost', 'catalystCost', 'energyCost', 'otherCost'] as const;

/** Fuel out may not exceed oil in by more than this factor: methyl esters come out at roughly the
 *  oil's volume (some swell from the methanol), never 10 % more (common practice, from memory). */
export const MAX_YIELD_RATIO = 1.1;

const VERDICTS: Record<string, 'pass' | 'fail'> = {
  pass: 'pass',
  passed: 'pass',
  ok: 'pass',
  good: 'pass',
  fail: 'fail',
  failed: 'fail',
  bad: 'fail',
};

interface Plan {
  number: number | null;
  date: string;
  oilLiters: string;
  fuelLiters: string;
  costs: {
    methanol: number;
    catalyst: number;
    energy: number;
    feedstock: number;
    other: number;
    total: number;
    perGallon: number | null;
  } | null;
  verdict: 'pass' | 'fail' | 'incomplete';
  notes: string | null;
}

/** A volume cell in the co-op's unit → whole millilitres (null when the cell is wrong). */
function volumeMl(c: ReturnType<typeof rowChecker>, field: Key, raw: string, units: 'us' | 'metric'): number | null {
  const q = c.take(field, readQuantity(raw, units));
  if (q === null) return null;
  const ml = milliUnitsToMl(toMilli(q), units);
  if (ml <= 0) {
    c.fail(field, 'Must be more than zero.');
    return null;
  }
  return ml;
}

/** The row's costs: either a cost per unit (the whole cost, with no breakdown) or the input costs. */
function costsOf(
  c: ReturnType<typeof rowChecker>,
  cells: Record<Key, string>,
  units: 'us' | 'metric',
  fuelMl: number | null,
): Plan['costs'] | undefined {
  const given = INPUT_COSTS.filter((k) => cells[k].trim() !== '');
  const perUnitGiven = cells.costPerUnit.trim() !== '';
  if (perUnitGiven && given.length > 0) {
    c.fail('costPerUnit', 'Give either the cost per unit or the input costs, not both.');
    return undefined;
  }
  const cents = (k: Key) => {
    const v = c.take(k, readMoneyCents(cells[k], units));
    if (v !== null && v < 0) c.fail(k, 'A cost cannot be negative.');
    return v;
  };
  if (perUnitGiven) {
    const per = cents('costPerUnit');
    if (per === null || per < 0 || fuelMl === null) return undefined;
    const total = roundHalfUp(per * mlToUnits(fuelMl, units));
    // A US co-op's cost per gallon is kept as written; a metric co-op's is worked out like a release's.
    const perGallon =
      units === 'us'
        ? per
        : batchCost({
            chemicalsCents: 0,
            energyCents: 0,
            feedstockCents: 0,
            otherCents: total,
            gallonsReleased: litersToGallons(fuelMl / 1000),
          }).costPerGallonCents;
    return { methanol: 0, catalyst: 0, energy: 0, feedstock: 0, other: total, total, perGallon };
  }
  if (given.length === 0) return null;
  const values = INPUT_COSTS.map((k) => (cells[k].trim() === '' ? 0 : cents(k)));
  if (values.some((v) => v === null || v === undefined || v < 0) || fuelMl === null) return undefined;
  const [feedstock, methanol, catalyst, energy, other] = values as [number, number, number, number, number];
  const cost = batchCost({
    chemicalsCents: methanol + catalyst,
    energyCents: energy,
    feedstockCents: feedstock,
    otherCents: other,
    gallonsReleased: litersToGallons(fuelMl / 1000),
  });
  return { methanol, catalyst, energy, feedstock, other, total: cost.totalCents, perGallon: cost.costPerGallonCents };
}

/**
 * Past batches in summary: the co-op's history from its spreadsheet (date, oil in, fuel out,
 * costs, the quality verdict and notes as recorded then) as batches in status `imported`. They
 * have no recipe, steps, tank or ledger rows — their fuel is long gone, or already counted by the
 * opening tank stock — but they count where history counts: the cost-per-gallon chart, the
 * quarterly report's produced volume (in the quarter of their date) and the planner's yield median.
 * Numbers: a given number must be new to the co-op and to the file; an empty one is numbered
 * after the highest (the co-op's batches and the file's), in file order, as a new batch would be.
 */
export const pastBatches: OpeningKind<Key, Plan> = {
  kind: 'past-batches',
  columns: COLUMNS,
  async check(actor: Actor, rows: CsvRow<Key>[], t?: Transaction): Promise<Checked<Plan>[]> {
    const { units, timezone, currency } = actor.coop;
    const wanted = rows.map((r) => Number(r.cells.number.trim())).filter((n) => Number.isSafeInteger(n) && n > 0);
    const taken = new Set(
      wanted.length
        ? (
            await Batch.findAll({
              attributes: ['number'],
              where: { coopId: actor.coop.id, number: wanted },
              raw: true,
              transaction: t,
            })
          ).map((b) => b.number)
        : [],
    );
    const today = todayIn(timezone);
    const seen = new Map<number, number>();
    return rows.map(({ line, cells }) => {
      const c = rowChecker(line, cells);
      let number: number | null = null;
      const rawNumber = cells.number.trim().replace(/^#/, '');
      if (rawNumber !== '') {
        const n = Number(rawNumber);
        if (!/^\d+$/.test(rawNumber) || !Number.isSafeInteger(n) || n <= 0 || n > 2_000_000_000)
          c.fail('number', `"${cells.number}" is not a batch number (a whole number from 1).`);
        else if (taken.has(n))
          c.fail('number', `The co-op already has a batch ${n}: renumber this one or leave the number empty.`);
        else if (seen.has(n)) c.fail('number', `Same batch number as row ${seen.get(n)}.`);
        else {
          seen.set(n, line);
          number = n;
        }
      }
      const date = c.take('date', readDate(cells.date, units));
      if (date && date > today) c.fail('date', 'The date is in the future: only batches already made can be imported.');
      const oilMl = volumeMl(c, 'oil', cells.oil, units);
      const fuelMl = volumeMl(c, 'fuel', cells.fuel, units);
      if (oilMl && fuelMl && fuelMl > oilMl * MAX_YIELD_RATIO) {
        c.fail(
          'fuel',
          `More fuel out than ${MAX_YIELD_RATIO} × the oil in (${formatMl(oilMl, units)}): check the two volumes.`,
        );
      }
      const costs = costsOf(c, cells, units, fuelMl);
      const verdictRaw = cells.verdict.trim().toLowerCase();
      const verdict = verdictRaw === '' ? 'incomplete' : VERDICTS[verdictRaw];
      if (!verdict) c.fail('verdict', `"${cells.verdict}" is not a verdict: write pass, fail or leave it empty.`);
      if (cells.notes.length > 2000) c.fail('notes', 'At most 2,000 characters.');
      const note =
        date && oilMl && fuelMl
          ? `${number ? `Batch ${number}` : 'Numbered on import'}, ${formatDate(date, timezone)}: ${formatMl(oilMl, units)} of oil → ${formatMl(fuelMl, units)} of fuel` +
            (costs
              ? `, ${formatCents(costs.total, currency)}${costs.perGallon !== null ? ` (${formatCents(costs.perGallon, currency)}/gal)` : ''}`
              : ', cost not recorded') +
            (verdict === 'pass' ? ', passed.' : verdict === 'fail' ? ', failed.' : '.')
          : '';
      return c.done(
        note,
        date && oilMl && fuelMl && costs !== undefined && verdict
          ? {
              number,
              date,
              oilLiters: mlToLiters(oilMl),
              fuelLiters: mlToLiters(fuelMl),
              costs,
              verdict,
              notes: cells.notes.trim() || null,
            }
          : null,
      );
    });
  },
  async apply(actor, rows, t) {
    const coopId = actor.coop.id;
    const highest = Number(
      (await Batch.max<number | null, Batch>('number', { where: { coopId }, transaction: t })) ?? 0,
    );
    let next = Math.max(highest, ...rows.map((r) => r.plan!.number ?? 0)) + 1;
    const created = await Batch.bulkCreate(
      rows.map(({ plan }) => {
        const p = plan!;
        const k = p.costs;
        const s = (v: number | null | undefined) => (v === null || v === undefined ? null : String(v));
        return {
          coopId,
          number: p.number ?? next++,
          status: 'imported' as const,
          batchDate: p.date,
          statusChangedAt: new Date(),
          oilLiters: p.oilLiters,
          releasedLiters: p.fuelLiters,
          releasedAt: new Date(`${p.date}T12:00:00Z`),
          tankId: null,
          qualityVerdict: p.verdict,
          notes: p.notes,
          createdByUserId: actor.user.id,
          costMethanolCents: s(k?.methanol),
          costCatalystCents: s(k?.catalyst),
          costEnergyCents: s(k?.energy),
          costFeedstockCents: s(k?.feedstock),
          costOtherCents: s(k?.other),
          totalCostCents: s(k?.total),
          costPerGallonCents: s(k?.perGallon),
          otherNotes:
            k && k.total === k.other && k.other > 0 && k.methanol + k.catalyst + k.energy + k.feedstock === 0
              ? 'Imported as one cost, without a breakdown'
              : null,
        } as unknown as Batch;
      }),
      { transaction: t, returning: ['id'] },
    );
    return created.map((b) => b.id);
  },
};

/**
 * Undoes imported past batches (deleted: they moved no fuel and no stock), refused (409) once a
 * batch was numbered after them in Tallyvat — deleting them then would leave a gap under it.
 */
export async function undoPastBatches(actor: Actor, batchIds: number[], t: Transaction): Promise<void> {
  const coopId = actor.coop.id;
  const mine = await Batch.findAll({
    attributes: ['number', 'createdAt'],
    where: { coopId, id: batchIds, status: 'imported' },
    raw: true,
    transaction: t,
  });
  if (mine.length === 0) return;
  const top = Math.max(...mine.map((b) => b.number));
  const since = new Date(Math.min(...mine.map((b) => new Date(b.createdAt).getTime())));
  const later = await Batch.count({
    where: { coopId, id: { [Op.notIn]: batchIds }, number: { [Op.gt]: top }, createdAt: { [Op.gte]: since } },
    transaction: t,
  });
  if (later > 0)
    throw conflict('Batches have been numbered after the imported ones since, so the import can no longer be undone.');
  await Batch.destroy({ where: { coopId, id: batchIds, status: 'imported' }, transaction: t });
}
