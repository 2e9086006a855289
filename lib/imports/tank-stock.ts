import 'server-only';
import { Op, type Transaction } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { conflict } from '@/lib/http';
import { formatCents, roundHalfUp } from '@/lib/money';
import { recordMovement } from '@/lib/tank/ledger';
import { litersToMl } from '@/lib/units/quantity';
import { formatMl, milliUnitsToMl, mlToUnits } from '@/lib/tank/volume';
import { Tank, TankMovement } from '@/models';
import type { CsvRow } from './csv-read';
import { rowChecker, type Checked, type OpeningKind } from './opening';
import { readMoneyCents, readQuantity, toMilli } from './values';

const COLUMNS = [
  { key: 'tank', headings: ['Tank', 'Tank name'], required: true },
  { key: 'quantity', headings: ['Gallons', 'Litres', 'Liters', 'Quantity', 'On hand'], required: true },
  {
    key: 'cost',
    headings: ['Cost per gallon', 'Cost per litre', 'Cost per liter', 'Unit cost', 'Cost'],
    required: true,
  },
] as const;
type Key = (typeof COLUMNS)[number]['key'];

interface Plan {
  tankId: number;
  quantityMl: number;
  valueCents: number;
}

/**
 * Opening tank stock: the fuel in each tank on moving day, with what it cost per unit, as one
 * `opening` ledger row per tank through the ledger service (recordMovement), so the tank's value
 * and average cost — and so the next draws' cost-based prices — start from it. Only a tank with
 * no ledger yet can take an opening entry (a tank in use gets a dip reading instead).
 */
export const openingTankStock: OpeningKind<Key, Plan> = {
  kind: 'opening-tank',
  columns: COLUMNS,
  async check(actor: Actor, rows: CsvRow<Key>[], t?: Transaction): Promise<Checked<Plan>[]> {
    const { units, currency } = actor.coop;
    const tanks = await Tank.findAll({
      attributes: ['id', 'name', 'active', 'capacityLiters', 'onHandLiters'],
      where: { coopId: actor.coop.id },
      raw: true,
      transaction: t,
    });
    const byName = new Map(tanks.map((x) => [x.name.trim().toLowerCase(), x]));
    // In use: fuel in it, or any ledger row other than an opening (an undone opening leaves two that cancel out).
    const used = new Set([
      ...tanks.filter((x) => litersToMl(x.onHandLiters) !== 0).map((x) => x.id),
      ...(
        await TankMovement.findAll({
          attributes: ['tankId'],
          where: { coopId: actor.coop.id, kind: { [Op.ne]: 'opening' } },
          group: ['tankId'],
          raw: true,
          transaction: t,
        })
      ).map((m) => m.tankId),
    ]);
    const seen = new Map<number, number>();
    return rows.map(({ line, cells }) => {
      const c = rowChecker(line, cells);
      const tank = byName.get(cells.tank.trim().toLowerCase());
      if (!cells.tank.trim()) c.fail('tank', 'Empty: enter the tank’s name.');
      else if (!tank)
        c.fail(
          'tank',
          `No tank is called "${cells.tank}". Tanks: ${tanks.map((x) => x.name).join(', ') || 'none yet (add one on the Tank page)'}.`,
        );
      else if (!tank.active) c.fail('tank', `${tank.name} is out of service.`);
      else if (used.has(tank.id))
        c.fail('tank', `${tank.name} already holds fuel or has entries in its ledger: record a dip reading instead.`);
      else if (seen.has(tank.id)) c.fail('tank', `Same tank as row ${seen.get(tank.id)}: one row per tank.`);
      if (tank) seen.set(tank.id, line);
      const qty = c.take('quantity', readQuantity(cells.quantity, units));
      const quantityMl = qty === null ? null : milliUnitsToMl(toMilli(qty), units);
      if (quantityMl === 0) c.fail('quantity', 'An empty tank needs no row.');
      if (tank && quantityMl && quantityMl > litersToMl(tank.capacityLiters)) {
        c.fail('quantity', `More than ${tank.name} holds (${formatMl(litersToMl(tank.capacityLiters), units)}).`);
      }
      const costCents = c.take('cost', readMoneyCents(cells.cost, units));
      if (costCents !== null && costCents < 0) c.fail('cost', 'A cost cannot be negative.');
      const valueCents = quantityMl && costCents !== null ? roundHalfUp(costCents * mlToUnits(quantityMl, units)) : 0;
      const note =
        tank && quantityMl && costCents !== null
          ? `${tank.name}: ${formatMl(quantityMl, units)} at ${formatCents(costCents, currency)} each, worth ${formatCents(valueCents, currency)}.`
          : '';
      return c.done(note, tank && quantityMl ? { tankId: tank.id, quantityMl, valueCents } : null);
    });
  },
  async apply(actor, rows, t) {
    const ids: number[] = [];
    for (const r of rows) {
      const m = await recordMovement(t, {
        coopId: actor.coop.id,
        tankId: r.plan!.tankId,
        kind: 'opening',
        quantityMl: r.plan!.quantityMl,
        valueCents: r.plan!.valueCents,
        reason: 'Opening stock (imported)',
        userId: actor.user.id,
      });
      ids.push(Number(m.id));
    }
    return ids;
  },
};

/**
 * Undoes opening stock with a reversing `opening` row per tank (the ledger is append-only), only
 * while nothing else has happened in those tanks: a draw, a release or a dip builds on the stock.
 */
export async function undoOpeningTankStock(actor: Actor, movementIds: number[], t: Transaction): Promise<void> {
  const openings = await TankMovement.findAll({
    attributes: ['id', 'tankId', 'quantityLiters', 'valueCents'],
    where: { coopId: actor.coop.id, id: movementIds },
    raw: true,
    transaction: t,
  });
  for (const o of openings) {
    await Tank.findOne({
      attributes: ['id'],
      where: { id: o.tankId, coopId: actor.coop.id },
      lock: t.LOCK.UPDATE,
      transaction: t,
    });
    const later = await TankMovement.count({
      where: { coopId: actor.coop.id, tankId: o.tankId, id: { [Op.gt]: o.id } },
      transaction: t,
    });
    if (later > 0)
      throw conflict(
        'Fuel has moved in or out of an imported tank since (a draw, a batch or a dip), so the opening stock can no longer be undone. Record a dip reading to correct it.',
      );
    await recordMovement(t, {
      coopId: actor.coop.id,
      tankId: o.tankId,
      kind: 'opening',
      quantityMl: -litersToMl(o.quantityLiters),
      valueCents: -Number(o.valueCents),
      reason: 'Opening stock import undone',
      userId: actor.user.id,
    });
  }
}
