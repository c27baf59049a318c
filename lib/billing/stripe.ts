import 'server-only';
import Stripe from 'stripe';
import { env } from '@/lib/env';

/**
 * The app's one client of the payment API. Built on first use from env (host, port and protocol point
 * it at the local fake in the demo and tests) and rebuilt only when those settings change. The SDK's
 * own retries are off: the usage sender retries with its own backoff and the screens say "try again".
 */
const g = globalThis as unknown as { tropopassStripe?: { settings: string; client: Stripe } };

function sdkApiVersion(configured: string): Stripe.LatestApiVersion {
  if (configured !== Stripe.API_VERSION) {
    throw new Error(
      `STRIPE_API_VERSION is "${configured}", but the installed stripe SDK is typed for "${Stripe.API_VERSION}". Set STRIPE_API_VERSION to that value.`,
    );
  }
  return Stripe.API_VERSION;
}

export function stripe(): Stripe {
  const e = env();
  const settings = [
    e.STRIPE_SECRET_KEY,
    e.STRIPE_API_HOST,
    e.STRIPE_API_PORT,
    e.STRIPE_API_PROTOCOL,
    e.STRIPE_API_VERSION,
    e.STRIPE_TIMEOUT_MS,
  ].join('|');
  if (g.tropopassStripe?.settings !== settings) {
    const client = new Stripe(e.STRIPE_SECRET_KEY, {
      host: e.STRIPE_API_HOST,
      port: e.STRIPE_API_PORT,
      protocol: e.STRIPE_API_PROTOCOL,
      apiVersion: sdkApiVersion(e.STRIPE_API_VERSION),
      maxNetworkRetries: 0,
      timeout: e.STRIPE_TIMEOUT_MS,
      telemetry: false,
      appInfo: { name: 'Tropopass' },
    });
    g.tropopassStripe = { settings, client };
  }
  return g.tropopassStripe.client;
}

export type StripeError = InstanceType<typeof Stripe.errors.StripeError>;

/**
 * By class, and by shape as well: should the SDK ever be loaded twice (two bundles), an error from the
 * other copy is still recognised instead of ending as a 500.
 */
export function isStripeError(err: unknown): err is StripeError {
  if (err instanceof Stripe.errors.StripeError) return true;
  if (!(err instanceof Error) || typeof err !== 'object') return false;
  const e = err as { type?: unknown; rawType?: unknown };
  return typeof e.type === 'string' && /^Stripe[A-Za-z]*Error$/.test(e.type) && 'rawType' in e;
}

/** Errors worth another try later: the service failed, throttled, or did not answer in time. */
export function isTransientStripeError(err: unknown): boolean {
  if (!isStripeError(err)) return false;
  if (err.type === 'StripeConnectionError' || err.type === 'StripeAPIError' || err.type === 'StripeRateLimitError')
    return true;
  const status = err.statusCode ?? 0;
  return status === 429 || status >= 500 || status === 0;
}

/** A short technical description for logs and the ledger's last_error; never shown to users. */
export function describeStripeError(err: unknown): string {
  if (isStripeError(err)) {
    return `${err.statusCode ?? 'no status'} ${err.type}${err.code ? `/${err.code}` : ''}: ${err.message}`.slice(
      0,
      480,
    );
  }
  return (err instanceof Error ? `${err.name}: ${err.message}` : String(err)).slice(0, 480);
}
