import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { queryRows, sequelize, statement } from '@/lib/db';
import { HttpError } from '@/lib/http';
import type { PricingPolicy } from '@/lib/pricing';
import { parseInstant } from '@/lib/reservations/window';
import type { UnitSystem } from '@/lib/units';
import type { pricingPolicyCreateSchema } from '@/lib/validation/tank';
import { PricePolicy } from '@/models';
import { describePolicy, perUnitToPerGallonText, policyInUnits, type PolicyRow } from './convert';

export interface PolicyDto {
  id: number;
  kind: PricingPolicy['kind'];
  /** The policy in the co-op's units (cents per gallon or per litre). */
  policy: PricingPolicy;
  /** As stored: cents per US gallon. */
  stored: { priceCentsPerGallon: number | null; marginCentsPerGallon: number | null; marginPct: number | null; surchargeCentsPerGallon: number; roadTaxCentsPerGallon: number };
  description: string;
  effectiveFrom: string;
  createdBy: string | null;
  createdAt: string;
  status: 'in-force' | 'scheduled' | 'past';
}

type Row = PolicyRow & { id: number; effective_from: Date; created_at: Date; created_by: string | null; in_force: boolean };

function policyDto(r: Row, units: UnitSystem, currency: string): PolicyDto {
  const policy = policyInUnits(r, units);
  const n = (v: string | number | null) => (v === null ? null : Number(v));
  return {
    id: r.id, kind: r.kind, policy,
    stored: {
      priceCentsPerGallon: n(r.price_cents_per_gallon), marginCentsPerGallon: n(r.margin_cents_per_gallon), marginPct: n(r.margin_pct),
      surchargeCentsPerGallon: Number(r.surcharge_cents_per_gallon), roadTaxCentsPerGallon: Number(r.road_tax_cents_per_gallon),
    },
    description: describePolicy(policy, units, currency),
    effectiveFrom: new Date(r.effective_from).toISOString(), createdAt: new Date(r.created_at).toISOString(), createdBy: r.created_by,
    status: r.in_force ? 'in-force' : new Date(r.effective_from).getTime() > Date.now() ? 'scheduled' : 'past',
  };
}

const POLICY_COLUMNS = `p.id, p.kind, p.price_cents_per_gallon, p.margin_cents_per_gallon, p.margin_pct, p.surcharge_cents_per_gallon,
  p.road_tax_cents_per_gallon, p.effective_from, p.created_at`;

/**
 * The policy in force for a co-op right now: the newest row whose effective_from has come
 * (ties go to the later insert). Null when the co-op has never set one.
 */
export const POLICY_IN_FORCE = statement(
  `SELECT ${POLICY_COLUMNS} FROM price_policies p WHERE p.coop_id = $1 AND p.effective_from <= now()
   ORDER BY p.effective_from DESC, p.id DESC LIMIT 1`,
  'tv_policy_in_force',
);

export async function policyInForce(coopId: number, transaction?: Transaction): Promise<(PolicyRow & { id: number }) | null> {
  const [row] = await queryRows<PolicyRow & { id: number }>(POLICY_IN_FORCE, [coopId], transaction);
  return row ?? null;
}

/** The policy in force as a DTO (any member may see the price they will pay). */
export async function getCurrentPolicy(actor: Actor): Promise<PolicyDto | null> {
  return (await listPolicies(actor, 1)).find((p) => p.status === 'in-force') ?? null;
}

/** Every policy the co-op has had (newest first), marking the one in force and any scheduled. */
export async function listPolicies(actor: Actor, limit = 200): Promise<PolicyDto[]> {
  const rows = await sequelize.query<Row>(
    `WITH cur AS (SELECT id FROM price_policies WHERE coop_id = :coopId AND effective_from <= now() ORDER BY effective_from DESC, id DESC LIMIT 1)
     SELECT ${POLICY_COLUMNS}, u.name AS created_by, (p.id = (SELECT id FROM cur)) AS in_force
     FROM price_policies p LEFT JOIN users u ON u.id = p.created_by_user_id
     WHERE p.coop_id = :coopId
     ORDER BY (p.id = (SELECT id FROM cur)) DESC, p.effective_from DESC, p.id DESC LIMIT :limit`,
    { replacements: { coopId: actor.coop.id, limit }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => policyDto({ ...r, in_force: Boolean(r.in_force) }, actor.coop.units, actor.coop.currency));
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
    if (!t) throw new HttpError(422, 'Some fields need attention.', { effectiveFrom: ['Enter a date and time.'] });
    if (t.getTime() < Date.now() - 5 * 60_000) {
      throw new HttpError(422, 'Some fields need attention.', { effectiveFrom: ['A new price cannot take effect in the past; draws already recorded keep their price.'] });
    }
    effectiveFrom = t;
  }
  const rate = (thousandthsOfCent: number | undefined) => (thousandthsOfCent === undefined ? '0.000' : perUnitToPerGallonText(thousandthsOfCent / 1000, units));
  const created = await sequelize.transaction(async (transaction) => {
    const p = await PricePolicy.create(
      {
        coopId: actor.coop.id, kind: input.kind,
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
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'pricing.create', entityType: 'price_policy', entityId: p.id, after: p.get({ plain: true }) }, transaction);
    return p;
  });
  const dto = (await listPolicies(actor)).find((p) => p.id === created.id);
  return dto!;
}
