import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import type { webhookReceivedSchema } from '@/lib/api/dto/billing';
import { inTransaction } from '@/lib/db';
import { HttpError } from '@/lib/http';
import { verifyWebhook, type ProviderEvent } from '@/lib/payments';
import { Coop, PaymentWebhookEvent } from '@/models';
import { completeAttemptSucceeded, markAttemptFailed } from './card';
import { lockCoopBilling } from './locks';
import { confirmRefund } from './refunds';

const positiveInt = (s: string | undefined): number | null => (s && /^[1-9]\d{0,9}$/.test(s) ? Number(s) : null);

/**
 * Handles one webhook delivery: verifies the signature over the raw body (400 and nothing stored
 * when it fails), stores the event id once (UNIQUE; a repeat is acknowledged and ignored), and
 * applies it in the same transaction, so a crash mid-way leaves nothing half-applied and the
 * provider's retry processes it again. Applying is itself idempotent and order-independent:
 *  - charge.succeeded → the attempt named in its metadata succeeds, one payment is recorded;
 *  - charge.failed → a still-open attempt is marked failed (a success is never undone);
 *  - charge.refunded → our refunds named in the refunds' metadata are confirmed.
 */
export async function receiveWebhook(
  rawBody: string,
  signature: string | null,
): Promise<z.infer<typeof webhookReceivedSchema>> {
  const event = verifyWebhook(rawBody, signature);
  if (!event) throw new HttpError(400, 'The webhook signature is not valid.');
  let payload: unknown;
  try {
    payload = JSON.parse(rawBody);
  } catch {
    throw new HttpError(400, 'The webhook body is not JSON.');
  }
  const named = positiveInt(event.charge?.metadata.coop_id);
  const coop = named ? await Coop.findByPk(named, { attributes: ['id'], raw: true }) : null;
  const coopId = coop?.id ?? null;

  return inTransaction(async (t) => {
    // The event id is UNIQUE: a repeat (even one arriving while this one is being applied, which
    // waits on the index and then finds the committed row) is acknowledged and ignored.
    const [stored, created] = await PaymentWebhookEvent.findOrCreate({
      where: { stripeEventId: event.id },
      defaults: {
        stripeEventId: event.id,
        type: event.type,
        coopId,
        objectId: event.charge?.id ?? null,
        outcome: 'received',
        payload,
      },
      transaction: t,
    });
    if (!created) return { received: true as const, duplicate: true, outcome: 'duplicate' };
    const outcome = coopId ? await apply(event, coopId, t) : 'ignored';
    await stored.update({ outcome }, { transaction: t });
    return { received: true as const, duplicate: false, outcome };
  });
}

async function apply(event: ProviderEvent, coopId: number, t: Transaction): Promise<string> {
  const charge = event.charge;
  if (!charge) return 'ignored';
  const attemptId = positiveInt(charge.metadata.payment_attempt_id);
  switch (event.type) {
    case 'charge.succeeded':
      if (!attemptId || !charge.succeeded) return 'ignored';
      return completeAttemptSucceeded(t, coopId, attemptId, charge, null);
    case 'charge.failed':
      if (!attemptId) return 'ignored';
      await lockCoopBilling(t, coopId);
      return markAttemptFailed(t, coopId, attemptId, 'card_declined', 'The card was declined.');
    case 'charge.refunded': {
      await lockCoopBilling(t, coopId);
      let applied = false;
      for (const r of charge.refunds) {
        const refundId = positiveInt(r.metadata.refund_id);
        if (refundId && r.succeeded && (await confirmRefund(t, coopId, refundId, r.id)) === 'applied') applied = true;
      }
      return applied ? 'applied' : 'no-change';
    }
    default:
      return 'ignored';
  }
}
