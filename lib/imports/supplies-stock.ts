import 'server-only';
import type { Transaction } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { todayIn } from '@/lib/dates';
import { conflict } from '@/lib/http';
import { formatCents } from '@/lib/money';
import { toStoredQuantity } from '@/lib/supplies/chemical-lots';
import { BatchOilLot, ChemicalConsumption, ChemicalLot, OilLot } from '@/models';
import type { CsvRow } from './csv-read';
import { rowChecker, type Checked, type OpeningKind } from './opening';
import { readDate, readMoneyCents, readNumber, readQuantity } from './values';

const COLUMNS = [
  { key: 'kind', headings: ['Kind', 'What', 'Chemical'], required: true },
  { key: 'quantity', headings: ['Quantity', 'On hand', 'Amount'], required: true },
  { key: 'unit', headings: ['Unit'], required: true },
  { key: 'totalCost', headings: ['Total cost', 'Cost', 'Value'], required: true },
  { key: 'purityPct', headings: ['Purity %', 'Purity'], required: false },
  { key: 'asOf', headings: ['As of', 'Date', 'Received'], required: false },
] as const;
type Key = (typeof COLUMNS)[number]['key'];

type Kind = 'methanol' | 'KOH' | 'NaOH' | 'oil';
const KINDS: Record<string, Kind> = { methanol: 'methanol', koh: 'KOH', naoh: 'NaOH', oil: 'oil' };
/** Units each kind may be given in (catalysts by weight; methanol and oil by volume). */
const UNITS: Record<Kind, readonly string[]> = {
  methanol: ['L', 'gal'],
  KOH: ['g', 'kg', 'lb'],
  NaOH: ['g', 'kg', 'lb'],
  oil: ['L', 'gal'],
};
const UNIT_NAMES: Record<string, 'L' | 'gal' | 'g' | 'kg' | 'lb'> = {
  l: 'L',
  liter: 'L',
  litre: 'L',
  liters: 'L',
  litres: 'L',
  gal: 'gal',
  gallon: 'gal',
  gallons: 'gal',
  g: 'g',
  kg: 'kg',
  lb: 'lb',
  lbs: 'lb',
};

interface Plan {
  kind: Kind;
  /** Litres (methanol, oil) or grams (catalysts), 3 decimals. */
  stored: string;
  totalCostCents: number;
  purityPct: string | null;
  asOf: string;
}

/** Row entity ids: chemical lots as positive ids, oil lots as negative ids (one list for undo). */
const OIL = -1;

/**
 * Chemicals and oil on hand on moving day, with what they cost: one chemical lot (methanol, KOH,
 * NaOH) or oil lot per row, supplier "Opening stock", so the stock screen, the planner's coverage
 * and first-in-first-out costing of the next batches start from them. Catalysts need their purity.
 */
export const openingSupplies: OpeningKind<Key, Plan> = {
  kind: 'opening-supplies',
  columns: COLUMNS,
  async check(actor: Actor, rows: CsvRow<Key>[]): Promise<Checked<Plan>[]> {
    const { units, currency, timezone } = actor.coop;
    const today = todayIn(timezone);
    return rows.map(({ line, cells }) => {
      const c = rowChecker(line, cells);
      const kind = KINDS[cells.kind.trim().toLowerCase()];
      if (!kind)
        c.fail(
          'kind',
          cells.kind
            ? `"${cells.kind}" is not one of methanol, KOH, NaOH, oil.`
            : 'Empty: enter methanol, KOH, NaOH or oil.',
        );
      const qty = c.take('quantity', readQuantity(cells.quantity, units));
      if (qty !== null && Number(qty) === 0) c.fail('quantity', 'Nothing on hand needs no row.');
      const unit = UNIT_NAMES[cells.unit.trim().toLowerCase()];
      if (!unit)
        c.fail(
          'unit',
          cells.unit ? `"${cells.unit}" is not a unit: use L, gal, g, kg or lb.` : 'Empty: enter the unit.',
        );
      else if (kind && !UNITS[kind].includes(unit)) c.fail('unit', `${kind} is counted in ${UNITS[kind].join(', ')}.`);
      const cost = c.take('totalCost', readMoneyCents(cells.totalCost, units));
      if (cost !== null && cost < 0) c.fail('totalCost', 'A cost cannot be negative.');
      let purity: string | null = null;
      if (kind === 'KOH' || kind === 'NaOH') {
        const p = cells.purityPct.trim()
          ? c.take('purityPct', readNumber(cells.purityPct.replace('%', ''), units))
          : null;
        if (!cells.purityPct.trim())
          c.fail('purityPct', 'Enter the purity from the label (KOH flake is usually about 90 %).');
        if (p !== null && !(Number(p) > 0 && Number(p) <= 100)) c.fail('purityPct', 'A purity between 0 and 100 %.');
        else if (p !== null) purity = Number(p).toFixed(2);
      } else if (cells.purityPct.trim()) c.fail('purityPct', 'Purity is recorded for KOH and NaOH only.');
      const asOf = cells.asOf.trim() ? c.take('asOf', readDate(cells.asOf, units)) : today;
      if (asOf && asOf > today) c.fail('asOf', 'The date is in the future.');
      const stored =
        qty !== null && unit && kind && UNITS[kind].includes(unit)
          ? toStoredQuantity(Number(qty), unit).quantity.toFixed(3)
          : null;
      if (stored !== null && Number(stored) <= 0) c.fail('quantity', 'Too small to record.');
      const note =
        kind && stored && cost !== null ? `${kind}: ${qty} ${unit} worth ${formatCents(cost, currency)}.` : '';
      return c.done(
        note,
        kind && stored && cost !== null && asOf
          ? { kind, stored, totalCostCents: cost, purityPct: purity, asOf }
          : null,
      );
    });
  },
  async apply(actor, rows, t) {
    const ids: number[] = [];
    for (const r of rows) {
      const p = r.plan!;
      if (p.kind === 'oil') {
        const lot = await OilLot.create(
          {
            coopId: actor.coop.id,
            collectedFrom: 'Opening stock',
            collectedOn: p.asOf,
            volumeLiters: p.stored,
            costCents: String(p.totalCostCents),
            waterNotes: null,
            solidsNotes: null,
            titrationMl: null,
            titrant: null,
            createdByUserId: actor.user.id,
          },
          { transaction: t },
        );
        ids.push(OIL * lot.id);
      } else {
        const lot = await ChemicalLot.create(
          {
            coopId: actor.coop.id,
            kind: p.kind,
            description: null,
            supplier: 'Opening stock',
            receivedOn: p.asOf,
            quantityUnit: p.kind === 'methanol' ? 'L' : 'g',
            quantity: p.stored,
            remainingQuantity: p.stored,
            totalCostCents: String(p.totalCostCents),
            purityPct: p.purityPct,
            notes: 'Imported as opening stock',
            createdByUserId: actor.user.id,
          },
          { transaction: t },
        );
        ids.push(lot.id);
      }
    }
    return ids;
  },
};

/** Undoes opening supplies: refused (409) once a batch has used any of the lots. */
export async function undoOpeningSupplies(actor: Actor, ids: number[], t: Transaction): Promise<void> {
  const coopId = actor.coop.id;
  const chemical = ids.filter((i) => i > 0);
  const oil = ids.filter((i) => i < 0).map((i) => -i);
  await ChemicalLot.findAll({
    attributes: ['id'],
    where: { coopId, id: chemical },
    lock: t.LOCK.UPDATE,
    transaction: t,
  });
  await OilLot.findAll({ attributes: ['id'], where: { coopId, id: oil }, lock: t.LOCK.UPDATE, transaction: t });
  const used =
    (await ChemicalConsumption.count({ where: { coopId, chemicalLotId: chemical }, transaction: t })) +
    (await BatchOilLot.count({ where: { coopId, oilLotId: oil }, transaction: t }));
  if (used > 0) throw conflict('A batch has used some of this stock, so the import can no longer be undone.');
  await ChemicalLot.destroy({ where: { coopId, id: chemical }, transaction: t });
  await OilLot.destroy({ where: { coopId, id: oil }, transaction: t });
}
