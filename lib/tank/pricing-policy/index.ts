import 'server-only';
import type { pricePolicySchema } from '@/lib/api/dto/tank';
import { fn, Op, type InferAttributes, type Order, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { invalidFields } from '@/lib/http';
import { parseInstant } from '@/lib/tank/reservations/window';
import type { UnitSystem } from '@/lib/units';
import type { pricingPolicyCreateSchema } from '@/lib/validation/tank';
import { PricePolicy, User } from '@/models';
import { describePolicy, perUnitToPerGallonText, policyInUnits, type PolicyRow } from './convert';
import { numericOrNull } from '@/lib/units/quantity';

export type PolicyDto = z.infer<typeof pricePolicySchema>;

/** A policy as the history reads it, with who set it. */
type PolicyListRow = Pick<
  InferAttributes<PricePolicy>,
  | 'id'
  | 'kind'
  | 'priceCentsPerGallon'
  | 'marginCentsPerGallon'
  | 'marginPct'
  | 'surchargeCentsPerGallon'
  | 'roadTaxCentsPerGallon'
  | 'effectiveFrom'
  | 'createdAt'
> & {
  createdBy: { name: string | null };
};

const POLICY_ATTRIBUTES = [
  'id',
  'kind',
  'priceCentsPerGallon',
  'marginCentsPerGallon',
  'marginPct',
  'surchargeCentsPerGallon',
  'roadTaxCentsPerGallon',
  'effectiveFrom',
  'createdAt',
] as const;

/** The stored rates in the shape lib/tank/pricing-policy/convert reads (cents per US gallon). */
function policyRow(
  r: Pick<
    InferAttributes<PricePolicy>,
    | 'kind'
    | 'priceCentsPerGallon'
    | 'marginCentsPerGallon'
    | 'marginPct'
    | 'surchargeCentsPerGallon'
    | 'roadTaxCentsPerGallon'
  >,
): PolicyRow {
  return {
    kind: r.kind,
    price_cents_per_gallon: r.priceCentsPerGallon,
    margin_cents_per_gallon: r.marginCentsPerGallon,
    margin_pct: r.marginPct,
    surcharge_cents_per_gallon: r.surchargeCentsPerGallon,
    road_tax_cents_per_gallon: r.roadTaxCentsPerGallon,
  };
}

function policyDto(r: PolicyListRow, inForce: boolean, units: UnitSystem, currency: string): PolicyDto {
  const stored = policyRow(r);
  const policy = policyInUnits(stored, units);
  return {
    id: r.id,
    kind: r.kind,
    policy,
    stored: {
      priceCentsPerGallon: numericOrNull(r.priceCentsPerGallon),
      marginCentsPerGallon: numericOrNull(r.marginCentsPerGallon),
      marginPct: numericOrNull(r.marginPct),
      surchargeCentsPerGallon: Number(r.surchargeCentsPerGallon),
      roadTaxCentsPerGallon: Number(r.roadTaxCentsPerGallon),
    },
    description: describePolicy(policy, units, currency),
    effectiveFrom: new Date(r.effectiveFrom).toISOString(),
    createdAt: new Date(r.createdAt).toISOString(),
    createdBy: r.createdBy?.name ?? null,
    status: inForce ? 'in-force' : new Date(r.effectiveFrom).getTime() > Date.now() ? 'scheduled' : 'past',
  };
}

/** Newest first: the latest effective_from, ties to the later insert. */
const POLICY_ORDER: Order = [
  ['effectiveFrom', 'DESC'],
  ['id', 'DESC'],
];

/**
 * The policy in force for a co-op right now: the newest row whose effective_from has come
 * (ties go to the later insert). Null when the co-op has never set one.
 */
export async function policyInForce(
  coopId: number,
  transaction?: Transaction,
): Promise<(PolicyRow & { id: number }) | null> {
  const row = await PricePolicy.findOne({
    attributes: [
      'id',
      'kind',
      'priceCentsPerGallon',
      'marginCentsPerGallon',
      'marginPct',
      'surchargeCentsPerGallon',
      'roadTaxCentsPerGallon',
    ],
    where: { coopId, effectiveFrom: { [Op.lte]: fn('now') } },
    order: POLICY_ORDER,
    transaction,
    raw: true,
  });
  return row ? { id: row.id, ...policyRow(row) } : null;
}

/** The policy in force as a DTO (any member may see the price they will pay). */
export async function getCurrentPolicy(actor: Actor): Promise<PolicyDto | null> {
  const row = (await PricePolicy.findOne({
    attributes: [...POLICY_ATTRIBUTES],
    where: { coopId: actor.coop.id, effectiveFrom: { [Op.lte]: fn('now') } },
    include: [{ model: User, as: 'createdBy', attributes: ['name'], required: false }],
    order: POLICY_ORDER,
    raw: true,
    nest: true,
  })) as unknown as PolicyListRow | null;
  return row ? policyDto(row, true, actor.coop.units, actor.coop.currency) : null;
}

/** Every policy the co-op has had (newest first, the one in force at the top), marking the one in force and any scheduled. */
export async function listPolicies(actor: Actor, limit = 200): Promise<PolicyDto[]> {
  const rows = (await PricePolicy.findAll({
    attributes: [...POLICY_ATTRIBUTES],
    where: { coopId: actor.coop.id },
    include: [{ model: User, as: 'createdBy', attributes: ['name'], required: false }],
    order: POLICY_ORDER,
    limit,
    raw: true,
    nest: true,
  })) as unknown as PolicyListRow[];
  // In that order, the first whose start has come is in force; scheduled ones come before it.
  const now = Date.now();
  const current = rows.findIndex((r) => new Date(r.effectiveFrom).getTime() <= now);
  const ordered = current > 0 ? [rows[current]!, ...rows.slice(0, current), ...rows.slice(current + 1)] : rows;
  return ordered.map((r) => policyDto(r, current >= 0 && r === rows[current], actor.coop.units, actor.coop.currency));
}

/**
 * Sets a new pricing policy (treasurer/admin). Insert-only: the old rows stay as history and
 * draws already recorded keep the price locked on them. Amounts are per co-op unit; they are
 * stored per US gallon.
 */
export async function createPolicy(actor: Actor, input: z.infer<typeof pricingPolicyCreateSchema>): Promise<PolicyDto> {
  const units = actor.coop.units;
  let effectiveFrom = new Date();
  if (input.effectiveFrom) {
    const t = parseInstant(input.effectiveFrom, actor.coop.timezone);
    if (!t) throw invalidFields({ effectiveFrom: ['Enter a date and time.'] });
    if (t.getTime() < Date.now() - 5 * 60_000) {
      throw invalidFields({
        effectiveFrom: ['A new price cannot take effect in the past; draws already recorded keep their price.'],
      });
    }
    effectiveFrom = t;
  }
  const rate = (thousandthsOfCent: number | undefined) =>
    thousandthsOfCent === undefined ? '0.000' : perUnitToPerGallonText(thousandthsOfCent / 1000, units);
  const created = await inTransaction(async (transaction) => {
    const p = await PricePolicy.create(
      {
        coopId: actor.coop.id,
        kind: input.kind,
        priceCentsPerGallon: input.kind === 'fixed' ? perUnitToPerGallonText(input.price!, units) : null,
        marginCentsPerGallon: input.kind === 'cost-plus-amount' ? perUnitToPerGallonText(input.margin!, units) : null,
        marginPct: input.kind === 'cost-plus-percent' ? (input.marginPct! / 100).toFixed(2) : null,
        surchargeCentsPerGallon: rate(input.surchargeCents),
        roadTaxCentsPerGallon: rate(input.roadTaxCents),
        effectiveFrom,
        createdByUserId: actor.user.id,
      },
      { transaction },
    );
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'pricing.create',
        entityType: 'price_policy',
        entityId: p.id,
        after: p.get({ plain: true }),
      },
      transaction,
    );
    return p;
  });
  const dto = (await listPolicies(actor)).find((p) => p.id === created.id);
  return dto!;
}
