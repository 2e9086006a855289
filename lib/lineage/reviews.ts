import 'server-only';
import { Op, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { loadBatch, labResultsOf } from '@/lib/brewing/stored';
import { inTransaction } from '@/lib/db';
import { conflict, notFound, invalidFields } from '@/lib/http';
import { enqueueMail } from '@/lib/jobs';
import { evaluateQuality, formatQualityLimit, formatQualityValue, type QualityResults } from '@/lib/quality';
import { recordMovement } from '@/lib/tank/ledger';
import { refreshHeld } from '@/lib/tank/lineage';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import type { lateLabResultSchema, reviewCloseSchema } from '@/lib/validation/lineage';
import type { lateLabResultAnsweredSchema } from '@/lib/api/dto/lineage';
import { Batch, BatchFile, BatchReview, Membership, Reservation, Tank, TankLayer, User } from '@/models';
import { outcomeMail, recallMail, reservationHeldMail } from './mail';
import { batchShareRows, drawsAndMembers, reviewDto, type ReviewDto } from './read';

const bad = (fields: Record<string, string[]>) => invalidFields(fields);

/** The co-op's brewers and admins, named in the e-mails as whom to contact. */
async function contacts(coopId: number, t: Transaction) {
  const rows = (await Membership.findAll({
    attributes: [],
    where: { coopId, status: 'active', role: { [Op.in]: ['brewer', 'admin'] } },
    include: [{ model: User, as: 'user', attributes: ['name', 'email'], required: true }],
    order: [['id', 'ASC']],
    limit: 4,
    raw: true,
    nest: true,
    transaction: t,
  })) as unknown as { user: { name: string; email: string } }[];
  return rows.map((r) => r.user);
}

/** Tanks holding some of the batch now, with the millilitres of it in each (oldest layer first). */
async function batchLayersByTank(t: Transaction, coopId: number, batchId: number): Promise<Map<number, number>> {
  const layers = await TankLayer.findAll({
    attributes: ['tankId', 'quantityLiters'],
    where: { coopId, batchId },
    order: [
      ['tankId', 'ASC'],
      ['id', 'ASC'],
    ],
    transaction: t,
    raw: true,
  });
  const out = new Map<number, number>();
  for (const l of layers) out.set(l.tankId, (out.get(l.tankId) ?? 0) + litersToMl(l.quantityLiters));
  return out;
}

/**
 * Puts a released batch under review, in the caller's transaction: the review row, the batch's
 * fuel held in every tank that has some (tanks.held_liters), an e-mail to every member who drew
 * some of it (net of reversals) with the finding, the cautions and their volume, and one to each
 * member whose open reservation on a held tank can no longer be covered. Audited.
 */
export async function openReviewIn(
  t: Transaction,
  actor: Actor,
  batch: { id: number; number: number; status: string },
  cause: 'lab-result' | 'flag',
  finding: string,
): Promise<number> {
  const coopId = actor.coop.id;
  if (batch.status !== 'released')
    throw conflict(`Batch ${batch.number} has not been released; only released fuel can be recalled.`);
  const already = await BatchReview.findOne({
    attributes: ['id'],
    where: { coopId, batchId: batch.id, status: 'open' },
    transaction: t,
    raw: true,
  });
  if (already) throw conflict(`Batch ${batch.number} is already under review.`, { reviewId: already.id });
  const tanks = await batchLayersByTank(t, coopId, batch.id);
  const review = await BatchReview.create(
    {
      coopId,
      batchId: batch.id,
      cause,
      finding,
      heldLiters: mlToLiters([...tanks.values()].reduce((a, x) => a + x, 0)),
      openedByUserId: actor.user.id,
    },
    { transaction: t },
  );
  const held: Record<number, string> = {};
  for (const tankId of [...tanks.keys()].sort((a, b) => a - b))
    held[tankId] = mlToLiters(await refreshHeld(t, coopId, tankId));

  const ctx = {
    coopName: actor.coop.name,
    coopSlug: actor.coop.slug,
    units: actor.coop.units,
    batchNumber: batch.number,
    contacts: await contacts(coopId, t),
  };
  const rows = await batchShareRows(coopId, batch.id, t);
  const { draws, members } = drawsAndMembers(rows, actor.coop.units);
  for (const m of members) {
    const drawCount = draws.filter((d) => d.membershipId === m.membershipId && !d.isReversal).length;
    await enqueueMail(recallMail(ctx, { ...m, drawCount }, finding), { kind: 'none' }, t);
  }
  // Open reservations on held tanks that the drawable fuel no longer covers are told.
  const told: number[] = [];
  for (const tankId of tanks.keys()) {
    const tank = await Tank.findOne({
      attributes: ['name', 'onHandLiters', 'reservedLiters', 'heldLiters'],
      where: { id: tankId, coopId },
      transaction: t,
      raw: true,
    });
    if (!tank || litersToMl(tank.onHandLiters) - litersToMl(tank.heldLiters) >= litersToMl(tank.reservedLiters))
      continue;
    const open = (await Reservation.findAll({
      attributes: ['id'],
      where: { coopId, tankId, status: 'open', windowEnd: { [Op.gte]: new Date() } },
      include: [
        {
          model: Membership,
          as: 'membership',
          attributes: [],
          include: [{ model: User, as: 'user', attributes: ['name', 'email'] }],
        },
      ],
      raw: true,
      nest: true,
      transaction: t,
    })) as unknown as { id: number; membership: { user: { name: string; email: string } } }[];
    for (const r of open) {
      told.push(r.id);
      await enqueueMail(reservationHeldMail(ctx, { ...r.membership.user, tankName: tank.name }), { kind: 'none' }, t);
    }
  }
  await audit(
    {
      coopId,
      actorUserId: actor.user.id,
      action: 'batch.review.open',
      entityType: 'batch',
      entityId: batch.id,
      after: {
        reviewId: review.id,
        cause,
        finding,
        heldLitersByTank: held,
        membersEmailed: members.map((m) => m.membershipId),
        reservationsTold: told,
      },
    },
    t,
  );
  return review.id;
}

/** A brewer or admin flags a released batch: it goes under review (see {@link openReviewIn}). */
export async function flagBatch(actor: Actor, batchId: number, finding: string): Promise<ReviewDto> {
  const id = await inTransaction(async (t) => {
    const row = await loadBatch(actor.coop.id, batchId, t, true);
    return openReviewIn(t, actor, row, 'flag', finding);
  });
  return reviewDto((await BatchReview.findOne({ where: { id, coopId: actor.coop.id }, raw: true }))!);
}

/**
 * Records laboratory results that arrived after release. The batch's stored verdict is re-derived;
 * when a newly recorded result fails a required property, the batch goes under review with the
 * failing rows as the finding. Returns the review opened, if any.
 */
export async function recordLateLabResult(
  actor: Actor,
  batchId: number,
  input: z.infer<typeof lateLabResultSchema>,
): Promise<z.infer<typeof lateLabResultAnsweredSchema>> {
  const coopId = actor.coop.id;
  const out = await inTransaction(async (t) => {
    const row = await loadBatch(coopId, batchId, t, true);
    if (row.status !== 'released')
      throw conflict(`Batch ${row.number} is not released; record its lab results on the batch record.`);
    const before = labResultsOf(row);
    const lab: QualityResults = { ...before, ...(input.labResults as QualityResults) };
    const evaluation = evaluateQuality(row.qualityStandard, lab);
    await Batch.update(
      { labResults: lab as Record<string, number>, qualityVerdict: evaluation.overall },
      { where: { id: batchId, coopId }, transaction: t },
    );
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'batch.lab-result',
        entityType: 'batch',
        entityId: batchId,
        before: {
          labResults: Object.fromEntries(
            Object.keys(input.labResults).map((k) => [k, before[k as keyof QualityResults] ?? null]),
          ),
          qualityVerdict: row.qualityVerdict,
        },
        after: { labResults: input.labResults, qualityVerdict: evaluation.overall },
      },
      t,
    );
    const failing = evaluation.rows.filter((r) => r.required && r.verdict === 'fail' && r.property in input.labResults);
    let reviewId: number | null = null;
    if (failing.length) {
      const open = await BatchReview.findOne({
        attributes: ['id'],
        where: { coopId, batchId, status: 'open' },
        transaction: t,
        raw: true,
      });
      const units = actor.coop.units;
      const finding = `Laboratory result outside the ${row.qualityStandard} limit: ${failing
        .map(
          (r) =>
            `${r.label} ${formatQualityValue(r, units)} (limit ${formatQualityLimit(r, units)}${r.laboratory ? `; ${r.laboratory}, ${r.method ?? ''} ${r.date ?? ''}`.trimEnd() : ''})`,
        )
        .join('; ')}.`;
      if (!open) reviewId = await openReviewIn(t, actor, row, 'lab-result', finding);
    }
    return { qualityVerdict: evaluation.overall, reviewId };
  });
  const review = out.reviewId
    ? reviewDto((await BatchReview.findOne({ where: { id: out.reviewId, coopId }, raw: true }))!)
    : null;
  return { qualityVerdict: out.qualityVerdict, review };
}

/**
 * Closes a batch's open review with its outcome, in one transaction: cleared (the fuel is
 * released again), re-treated (the held fuel leaves every tank as a 'retreat' ledger entry for the
 * named unreleased batch) or disposed of (a 'disposal' ledger entry; method and an uploaded
 * receipt required). Held fuel is recomputed, the members who drew the batch get a follow-up
 * e-mail, and the close is audited.
 */
export async function closeReview(
  actor: Actor,
  batchId: number,
  input: z.infer<typeof reviewCloseSchema>,
): Promise<ReviewDto> {
  const coopId = actor.coop.id;
  const id = await inTransaction(async (t) => {
    const row = await loadBatch(coopId, batchId, t, true);
    const review = await BatchReview.findOne({
      where: { coopId, batchId, status: 'open' },
      lock: t.LOCK.UPDATE,
      transaction: t,
    });
    if (!review) throw conflict(`Batch ${row.number} is not under review.`);
    if (input.outcome === 'disposed') {
      const file = await BatchFile.findOne({
        attributes: ['id', 'purpose'],
        where: { id: input.receiptFileId!, coopId, batchId },
        transaction: t,
        raw: true,
      });
      if (!file || file.purpose !== 'receipt')
        throw bad({ receiptFileId: ['Choose a receipt uploaded to this batch.'] });
    }
    if (input.outcome === 'retreated') {
      const next = await Batch.findOne({
        attributes: ['id', 'status'],
        where: { id: input.retreatBatchId!, coopId },
        transaction: t,
        raw: true,
      });
      if (!next || next.id === batchId) throw bad({ retreatBatchId: ['Choose another batch of this co-op.'] });
      if (next.status === 'released' || next.status === 'rejected' || next.status === 'imported')
        throw bad({ retreatBatchId: ['Choose a batch that is not yet released or rejected.'] });
    }
    const tanks = await batchLayersByTank(t, coopId, batchId);
    const movements: string[] = [];
    if (input.outcome !== 'cleared') {
      for (const [tankId, ml] of [...tanks.entries()].sort((a, b) => a[0] - b[0])) {
        const moved = await recordMovement(t, {
          coopId,
          tankId,
          kind: input.outcome === 'disposed' ? 'disposal' : 'retreat',
          quantityMl: -ml,
          batchId,
          reason:
            input.outcome === 'disposed'
              ? `Disposed of: ${input.disposalMethod}`
              : `Re-treated in batch #${input.retreatBatchId}`,
          userId: actor.user.id,
          lineage: { kind: 'shares', shares: [{ batchId, ml }] },
        });
        movements.push(moved.id);
      }
    }
    const before = { status: 'open', heldLiters: review.heldLiters };
    review.set({
      status: 'closed',
      outcome: input.outcome,
      outcomeNotes: input.notes,
      closedAt: new Date(),
      closedByUserId: actor.user.id,
      disposalMethod: input.outcome === 'disposed' ? input.disposalMethod! : null,
      receiptFileId: input.outcome === 'disposed' ? input.receiptFileId! : null,
      retreatBatchId: input.outcome === 'retreated' ? input.retreatBatchId! : null,
    });
    await review.save({ transaction: t });
    for (const tankId of tanks.keys()) await refreshHeld(t, coopId, tankId);

    const ctx = {
      coopName: actor.coop.name,
      coopSlug: actor.coop.slug,
      units: actor.coop.units,
      batchNumber: row.number,
      contacts: await contacts(coopId, t),
    };
    const { members } = drawsAndMembers(await batchShareRows(coopId, batchId, t), actor.coop.units);
    for (const m of members) await enqueueMail(outcomeMail(ctx, m, input.outcome, input.notes), { kind: 'none' }, t);
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'batch.review.close',
        entityType: 'batch',
        entityId: batchId,
        before,
        after: {
          reviewId: review.id,
          outcome: input.outcome,
          notes: input.notes,
          disposalMethod: review.disposalMethod,
          receiptFileId: review.receiptFileId,
          retreatBatchId: review.retreatBatchId,
          litersRemovedByTank: Object.fromEntries(
            [...tanks].map(([k, v]) => [k, input.outcome === 'cleared' ? '0.000' : mlToLiters(v)]),
          ),
          movementIds: movements,
          membersEmailed: members.map((m) => m.membershipId),
        },
      },
      t,
    );
    return review.id;
  });
  const r = await BatchReview.findOne({ where: { id, coopId }, raw: true });
  if (!r) throw notFound('Review not found.');
  return reviewDto(r);
}
