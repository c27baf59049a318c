import 'server-only';
import type Stripe from 'stripe';
import { ALL_LOOKUP_KEYS, METER_EVENT_NAME, PLANS, type PlanId } from './plans';
import { stripe } from './stripe';

/**
 * The payment service's ids for our plan catalogue (prices by lookup key, the meter by event name),
 * read once per client and kept: they never change while the app runs.
 */
interface Catalogue {
  client: Stripe;
  prices: Map<string, Stripe.Price>;
  meterId: string;
}

const g = globalThis as unknown as { tropopassCatalogue?: Promise<Catalogue> };

async function load(client: Stripe): Promise<Catalogue> {
  const [prices, meters] = await Promise.all([
    client.prices.list({ lookup_keys: [...ALL_LOOKUP_KEYS], active: true, limit: 100 }),
    client.billing.meters.list({ status: 'active', limit: 100 }),
  ]);
  const byKey = new Map(prices.data.filter((p) => p.lookup_key).map((p) => [p.lookup_key as string, p]));
  const missing = ALL_LOOKUP_KEYS.filter((k) => !byKey.has(k));
  if (missing.length) throw new Error(`The payment service has no price for ${missing.join(', ')}`);
  const meter = meters.data.find((m) => m.event_name === METER_EVENT_NAME);
  if (!meter) throw new Error(`The payment service has no active meter for ${METER_EVENT_NAME}`);
  return { client, prices: byKey, meterId: meter.id };
}

async function catalogue(): Promise<Catalogue> {
  const client = stripe();
  const cached = g.tropopassCatalogue ? await g.tropopassCatalogue.catch(() => null) : null;
  if (cached && cached.client === client) return cached;
  const next = load(client);
  g.tropopassCatalogue = next;
  next.catch(() => {
    if (g.tropopassCatalogue === next) g.tropopassCatalogue = undefined;
  });
  return next;
}

/** The base (flat monthly) and metered (per flight) price ids of a plan. */
export async function planPrices(planId: PlanId): Promise<{ base: string; metered: string }> {
  const c = await catalogue();
  const plan = PLANS[planId];
  return { base: c.prices.get(plan.baseLookupKey)!.id, metered: c.prices.get(plan.meteredLookupKey)!.id };
}

export async function meterId(): Promise<string> {
  return (await catalogue()).meterId;
}
