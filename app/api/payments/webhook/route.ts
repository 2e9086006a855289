import { receiveWebhook } from '@/lib/billing/webhooks';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/**
 * POST: events from the payments provider. Public, but nothing is believed until the signature
 * over the raw body checks out (400 otherwise); each event id is stored once.
 */
export const POST = handler(async (req) => {
  const raw = await req.text();
  return receiveWebhook(raw, req.headers.get('stripe-signature'));
});
