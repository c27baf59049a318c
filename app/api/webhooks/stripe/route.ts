import { readBodyText } from '@/lib/api/handler';
import { stripe } from '@/lib/billing/stripe';
import { handleStripeEvent } from '@/lib/billing/webhooks';
import { env } from '@/lib/env';
import { badRequest, toResponse } from '@/lib/errors';
import { log } from '@/lib/log';

/**
 * Payment-service events. The signature is checked over the raw body before anything is read from
 * it; a bad or missing one is a 400 and changes nothing. Replays of a processed event answer 200.
 */
export async function POST(req: Request): Promise<Response> {
  try {
    const raw = await readBodyText(req);
    const signature = req.headers.get('stripe-signature');
    if (!signature) throw badRequest('Missing Stripe-Signature header.');
    let event;
    try {
      event = stripe().webhooks.constructEvent(raw, signature, env().STRIPE_WEBHOOK_SECRET);
    } catch {
      log.warn({ event: 'billing.webhook_bad_signature' }, 'webhook signature rejected');
      throw badRequest('The webhook signature does not match.');
    }
    const outcome = await handleStripeEvent(event);
    return Response.json({ received: true, ...outcome }, { headers: { 'cache-control': 'no-store' } });
  } catch (err) {
    return toResponse(err);
  }
}
