import 'server-only';
import { fakeCardToken } from './test-cards';
import Stripe from 'stripe';

/**
 * The one adapter to the payments provider (the official `stripe` SDK). Nothing else imports
 * 'stripe'. In development and tests the SDK points at the local fake through
 * STRIPE_API_HOST/PORT/PROTOCOL; in production those are unset and it talks to the real API.
 * Provider objects are mapped to the app's own small types here.
 */

declare global {
  var __tallyvatStripe: Stripe | undefined;
}

function client(): Stripe {
  if (globalThis.__tallyvatStripe) return globalThis.__tallyvatStripe;
  const key = process.env.STRIPE_SECRET_KEY;
  if (!key)
    throw new ProviderUnavailable('Card payments are not configured on this server (STRIPE_SECRET_KEY is unset).');
  const host = process.env.STRIPE_API_HOST;
  const s = new Stripe(key, {
    ...(host
      ? {
          host,
          port: Number(process.env.STRIPE_API_PORT ?? 443),
          protocol: (process.env.STRIPE_API_PROTOCOL ?? 'https') as 'http' | 'https',
        }
      : {}),
    telemetry: false,
    // One quick retry on network trouble (the idempotency key makes it safe), and no 80-second
    // hangs: a member is waiting on the other side of the button.
    maxNetworkRetries: 1,
    timeout: 10_000,
  });
  globalThis.__tallyvatStripe = s;
  return s;
}

/** The provider could not be reached or answered with a server error: the outcome is unknown. */
export class ProviderUnavailable extends Error {}

/** A charge as the app sees it. */
export interface ProviderCharge {
  id: string;
  amountCents: number;
  currency: string;
  succeeded: boolean;
  metadata: Record<string, string>;
  cardLabel: string | null;
  refunds: ProviderRefund[];
}

export interface ProviderRefund {
  id: string;
  amountCents: number;
  succeeded: boolean;
  metadata: Record<string, string>;
}

export type ChargeOutcome =
  | { outcome: 'succeeded'; charge: ProviderCharge }
  | { outcome: 'declined'; code: string; message: string }
  | { outcome: 'rejected'; message: string }
  | { outcome: 'unavailable'; message: string };

export type RefundOutcome =
  | { outcome: 'succeeded'; refund: ProviderRefund }
  | { outcome: 'rejected'; message: string }
  | { outcome: 'unavailable'; message: string };

function mapRefund(r: Stripe.Refund): ProviderRefund {
  return {
    id: r.id,
    amountCents: r.amount,
    succeeded: r.status === 'succeeded',
    metadata: { ...(r.metadata ?? {}) } as Record<string, string>,
  };
}

/** Maps a provider charge (from an API answer or a webhook event) to the app's type. */
export function mapCharge(c: Stripe.Charge): ProviderCharge {
  const card = c.payment_method_details?.card;
  return {
    id: c.id,
    amountCents: c.amount,
    currency: c.currency,
    succeeded: c.status === 'succeeded' && c.paid === true,
    metadata: { ...(c.metadata ?? {}) } as Record<string, string>,
    cardLabel: card ? `${card.brand ?? 'card'} ending ${card.last4 ?? '????'}` : null,
    refunds: (c.refunds?.data ?? []).map(mapRefund),
  };
}

function classify(
  e: unknown,
):
  | { kind: 'declined'; code: string; message: string }
  | { kind: 'rejected'; message: string }
  | { kind: 'unavailable'; message: string } {
  if (e instanceof Stripe.errors.StripeCardError) {
    return {
      kind: 'declined',
      code: e.decline_code ?? e.code ?? 'card_declined',
      message: e.message || 'The card was declined.',
    };
  }
  if (
    e instanceof Stripe.errors.StripeConnectionError ||
    e instanceof Stripe.errors.StripeAPIError ||
    e instanceof Stripe.errors.StripeRateLimitError ||
    e instanceof ProviderUnavailable ||
    (e instanceof Stripe.errors.StripeError && (e.statusCode ?? 0) >= 500)
  ) {
    return { kind: 'unavailable', message: (e as Error).message };
  }
  if (e instanceof Stripe.errors.StripeError) return { kind: 'rejected', message: e.message };
  return { kind: 'unavailable', message: (e as Error)?.message ?? String(e) };
}

/**
 * Charges a card token once. `idempotencyKey` must come from our own row, stored before this
 * call: repeating the call with the same key never charges twice (the provider replays the
 * first answer).
 */
export async function chargeCard(input: {
  amountCents: number;
  currency: string;
  cardToken: string;
  description: string;
  metadata: Record<string, string>;
  idempotencyKey: string;
}): Promise<ChargeOutcome> {
  try {
    const charge = await client().charges.create(
      {
        amount: input.amountCents,
        currency: input.currency.toLowerCase(),
        source: fakeCardToken(input.cardToken),
        description: input.description,
        metadata: input.metadata,
      },
      { idempotencyKey: input.idempotencyKey },
    );
    const mapped = mapCharge(charge);
    if (!mapped.succeeded)
      return {
        outcome: 'declined',
        code: charge.failure_code ?? 'card_declined',
        message: charge.failure_message ?? 'The card was declined.',
      };
    return { outcome: 'succeeded', charge: mapped };
  } catch (e) {
    const c = classify(e);
    if (c.kind === 'declined') return { outcome: 'declined', code: c.code, message: c.message };
    if (c.kind === 'rejected') return { outcome: 'rejected', message: c.message };
    return { outcome: 'unavailable', message: c.message };
  }
}

/**
 * Looks up the charge made for one of our payment attempts, by the attempt id we put in its
 * metadata (for an attempt whose answer was lost). Lists charges created since `since` (newest
 * first at the provider; the local fake ignores the date filter and is walked whole, up to
 * `maxScan`).
 * @returns the charge, null when the provider has none, or 'unavailable' when it could not be asked
 */
export async function findChargeForAttempt(
  attemptId: number,
  since: Date,
  maxScan = 2000,
): Promise<ProviderCharge | null | 'unavailable'> {
  try {
    let scanned = 0;
    for await (const c of client().charges.list({
      limit: 100,
      created: { gte: Math.floor(since.getTime() / 1000) - 60 },
    })) {
      if (c.metadata?.payment_attempt_id === String(attemptId)) return mapCharge(c);
      if (++scanned >= maxScan) break;
    }
    return null;
  } catch (e) {
    console.error('[payments] charge lookup failed:', (e as Error).message);
    return 'unavailable';
  }
}

/** Refunds part or all of a charge once (same idempotency rule as {@link chargeCard}). */
export async function refundCharge(input: {
  chargeId: string;
  amountCents: number;
  metadata: Record<string, string>;
  idempotencyKey: string;
}): Promise<RefundOutcome> {
  try {
    const refund = await client().refunds.create(
      { charge: input.chargeId, amount: input.amountCents, metadata: input.metadata },
      { idempotencyKey: input.idempotencyKey },
    );
    return { outcome: 'succeeded', refund: mapRefund(refund) };
  } catch (e) {
    const c = classify(e);
    if (c.kind === 'unavailable') return { outcome: 'unavailable', message: c.message };
    return { outcome: 'rejected', message: c.message };
  }
}

/** A verified provider event, reduced to what the app uses. */
export interface ProviderEvent {
  id: string;
  type: string;
  charge: ProviderCharge | null;
}

/**
 * Verifies a webhook's signature over the RAW body (the exact bytes received) with the shared
 * secret, and returns the event; null when the signature or body is not valid.
 */
export function verifyWebhook(rawBody: string, signature: string | null): ProviderEvent | null {
  const secret = process.env.STRIPE_WEBHOOK_SECRET;
  if (!secret || !signature) return null;
  let event: Stripe.Event;
  try {
    event = Stripe.webhooks.constructEvent(rawBody, signature, secret);
  } catch {
    return null;
  }
  const obj = (event.data as { object?: { object?: string } } | undefined)?.object;
  return {
    id: event.id,
    type: event.type,
    charge: obj?.object === 'charge' ? mapCharge(obj as unknown as Stripe.Charge) : null,
  };
}
