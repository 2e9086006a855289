import 'server-only';
import type { drawSchema } from '@/lib/api/dto/tank';
import { col, fn, Op, type InferAttributes, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { can, type Actor } from '@/lib/auth';
import { notFound } from '@/lib/http';
import { parseWindowEdge } from '@/lib/tank/reservations/window';
import { drawBatches } from '@/lib/lineage/read';
import { litersToMl } from '@/lib/units/quantity';
import { mlToUnits3 } from '@/lib/tank/volume';
import type { drawListSchema } from '@/lib/validation/tank';
import { Draw, Membership, Tank, User } from '@/models';

// Reading draws: one draw, the list with its totals, and what the draw form pre-fills. Recording
// a draw is in ./record, reversing one in ./reverse.

export type DrawStatus = 'recorded' | 'reversed' | 'reversal';

export type DrawDto = z.infer<typeof drawSchema>;

/** A draw as the lists read it (raw, nested includes). */
type DrawListRow = Pick<
  InferAttributes<Draw>,
  | 'id'
  | 'tankId'
  | 'membershipId'
  | 'reservationId'
  | 'quantityLiters'
  | 'meterBefore'
  | 'meterAfter'
  | 'declaredUse'
  | 'vehicle'
  | 'unitPriceCentsPerGallon'
  | 'surchargeCentsPerGallon'
  | 'roadTaxCentsPerGallon'
  | 'fuelCents'
  | 'surchargeCents'
  | 'taxCents'
  | 'totalCents'
  | 'costValueCents'
  | 'reversesDrawId'
  | 'reason'
  | 'occurredAt'
> & {
  tank: { name: string };
  membership: { user: { name: string } };
  reversal: { id: number | null };
  recordedBy: { name: string | null };
};

const DRAW_ATTRIBUTES = [
  'id',
  'tankId',
  'membershipId',
  'reservationId',
  'quantityLiters',
  'meterBefore',
  'meterAfter',
  'declaredUse',
  'vehicle',
  'unitPriceCentsPerGallon',
  'surchargeCentsPerGallon',
  'roadTaxCentsPerGallon',
  'fuelCents',
  'surchargeCents',
  'taxCents',
  'totalCents',
  'costValueCents',
  'reversesDrawId',
  'reason',
  'occurredAt',
] as const;

/**
 * Tank name, member name, the entry that reversed it (at most one: UNIQUE reverses_draw_id) and
 * who recorded it, joined in the same query. `attributes: false` leaves a join's columns out
 * (for the totals, which only filter through it).
 */
const drawInclude = (coopId: number, withColumns = true) => [
  { model: Tank, as: 'tank', attributes: withColumns ? ['name'] : [], where: { coopId }, required: true },
  {
    model: Membership,
    as: 'membership',
    attributes: [],
    required: true,
    include: [{ model: User, as: 'user', attributes: withColumns ? ['name'] : [], required: true }],
  },
  { model: Draw, as: 'reversal', attributes: withColumns ? ['id'] : [], required: false },
  ...(withColumns ? [{ model: User, as: 'recordedBy', attributes: ['name'], required: false }] : []),
];

function drawDto(r: DrawListRow, actor: Actor): DrawDto {
  const units = actor.coop.units;
  const qMl = litersToMl(r.quantityLiters);
  const meter = (v: string | null) => (v === null ? null : mlToUnits3(litersToMl(v), units));
  const reversedBy = r.reversal?.id ?? null;
  return {
    id: r.id,
    tankId: r.tankId,
    tankName: r.tank.name,
    membershipId: r.membershipId,
    memberName: r.membership.user.name,
    reservationId: r.reservationId,
    quantityLiters: qMl / 1000,
    quantity: mlToUnits3(qMl, units),
    meterBefore: meter(r.meterBefore),
    meterAfter: meter(r.meterAfter),
    declaredUse: r.declaredUse,
    vehicle: r.vehicle,
    unitPriceCentsPerGallon: Number(r.unitPriceCentsPerGallon),
    surchargeCentsPerGallon: Number(r.surchargeCentsPerGallon),
    roadTaxCentsPerGallon: Number(r.roadTaxCentsPerGallon),
    fuelCents: Number(r.fuelCents),
    surchargeCents: Number(r.surchargeCents),
    taxCents: Number(r.taxCents),
    totalCents: Number(r.totalCents),
    costValueCents: Number(r.costValueCents),
    reversesDrawId: r.reversesDrawId,
    reversedByDrawId: reversedBy,
    reason: r.reason,
    recordedBy: r.recordedBy?.name ?? null,
    occurredAt: new Date(r.occurredAt).toISOString(),
    status: r.reversesDrawId !== null ? 'reversal' : reversedBy !== null ? 'reversed' : 'recorded',
    batches: [],
  };
}

/** Adds each draw's batches (one indexed read for the page). */
async function withBatches(actor: Actor, draws: DrawDto[]): Promise<DrawDto[]> {
  const map = await drawBatches(
    actor.coop.id,
    actor.coop.units,
    draws.map((d) => d.id),
  );
  for (const d of draws) d.batches = map.get(d.id) ?? [];
  return draws;
}

/** One draw: a member sees their own, brewers/treasurers/admins any of the co-op's; else 404. */
export async function getDraw(actor: Actor, id: number): Promise<DrawDto> {
  const row = (await Draw.findOne({
    attributes: [...DRAW_ATTRIBUTES],
    where: { id, coopId: actor.coop.id },
    include: drawInclude(actor.coop.id),
    raw: true,
    nest: true,
  })) as unknown as DrawListRow | null;
  if (!row || (row.membershipId !== actor.membershipId && !can(actor.role, 'draws:read-all')))
    throw notFound('Draw not found.');
  return withBatches(actor, [drawDto(row, actor)]).then(([d]) => d!);
}

const DRAW_SORT = { occurred_at: 'occurredAt', quantity: 'quantityLiters', total: 'totalCents' } as const;

/**
 * Draws of the co-op, a page at a time, with totals for the filter. Members see their own;
 * draws:read-all roles see all and may filter by member, tank, status and date (co-op's days).
 */
export async function listDraws(actor: Actor, q: z.infer<typeof drawListSchema>, opts: { own?: boolean } = {}) {
  const own = opts.own || !can(actor.role, 'draws:read-all');
  const tz = actor.coop.timezone;
  const coopId = actor.coop.id;
  const conds: WhereOptions<Draw>[] = [{ coopId }];
  if (own) conds.push({ membershipId: actor.membershipId });
  else if (q.membershipId) conds.push({ membershipId: q.membershipId });
  if (q.tankId) conds.push({ tankId: q.tankId });
  // Reversed or not is read through the joined reversal ($reversal.id$).
  if (q.status === 'reversal') conds.push({ reversesDrawId: { [Op.ne]: null } });
  if (q.status === 'reversed') conds.push({ reversesDrawId: null, '$reversal.id$': { [Op.ne]: null } });
  if (q.status === 'recorded') conds.push({ reversesDrawId: null, '$reversal.id$': null });
  const from = q.from ? parseWindowEdge(q.from, tz, false) : null;
  const to = q.to ? parseWindowEdge(q.to, tz, true) : null;
  if (from) conds.push({ occurredAt: { [Op.gte]: from } });
  if (to) conds.push({ occurredAt: { [Op.lt]: to } });
  const where = { [Op.and]: conds };
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const [rows, agg] = await Promise.all([
    Draw.findAll({
      attributes: [...DRAW_ATTRIBUTES],
      where,
      include: drawInclude(coopId),
      order: [
        [DRAW_SORT[q.sort as keyof typeof DRAW_SORT], dir],
        ['id', 'DESC'],
      ],
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
      raw: true,
      nest: true,
    }) as unknown as Promise<DrawListRow[]>,
    Draw.findOne({
      attributes: [
        // The main table's alias is the model's name (minified in the production build).
        [fn('count', col(`${Draw.name}.id`)), 'n'],
        [fn('coalesce', fn('sum', col(`${Draw.name}.quantity_liters`)), 0), 'liters'],
        [fn('coalesce', fn('sum', col(`${Draw.name}.total_cents`)), 0), 'total'],
      ],
      where,
      include: drawInclude(coopId, false),
      raw: true,
    }) as unknown as Promise<{ n: string; liters: string; total: string } | null>,
  ]);
  const netMl = litersToMl(String(agg?.liters ?? '0'));
  return {
    items: await withBatches(
      actor,
      rows.map((r) => drawDto(r, actor)),
    ),
    page: q.page,
    pageSize: q.pageSize,
    total: Number(agg?.n ?? 0),
    totals: {
      quantityLiters: netMl / 1000,
      quantity: mlToUnits3(netMl, actor.coop.units),
      totalCents: Number(agg?.total ?? 0),
    },
  };
}

/** Active members of the co-op for the draw form and the filters (draws:read-all roles). */
export async function listDrawMembers(actor: Actor): Promise<{ membershipId: number; name: string }[]> {
  if (!can(actor.role, 'draws:read-all')) return [{ membershipId: actor.membershipId, name: actor.user.name }];
  const rows = (await Membership.findAll({
    attributes: ['id'],
    where: { coopId: actor.coop.id, status: 'active' },
    include: [{ model: User, as: 'user', attributes: ['name'], required: true }],
    order: [
      [{ model: User, as: 'user' }, 'name', 'ASC'],
      ['id', 'ASC'],
    ],
    raw: true,
    nest: true,
  })) as unknown as (Pick<InferAttributes<Membership>, 'id'> & { user: { name: string } })[];
  return rows.map((m) => ({ membershipId: m.id, name: m.user.name }));
}

/**
 * The pump meter's last reading per tank (from its latest metered draw), in the co-op's units,
 * to pre-fill "meter before" on the draw form. Looks at the latest 200 metered draws only.
 */
export async function lastMeterReadings(actor: Actor): Promise<Record<number, number>> {
  const rows = (await Draw.findAll({
    attributes: ['tankId', 'meterAfter'],
    where: { coopId: actor.coop.id, meterAfter: { [Op.ne]: null } },
    order: [
      ['occurredAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: 200,
    raw: true,
  })) as Pick<InferAttributes<Draw>, 'tankId' | 'meterAfter'>[];
  const out: Record<number, number> = {};
  for (const r of rows)
    if (!(r.tankId in out) && r.meterAfter !== null)
      out[r.tankId] = mlToUnits3(litersToMl(r.meterAfter), actor.coop.units);
  return out;
}
