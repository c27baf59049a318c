import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { afterAll, beforeAll } from 'vitest';
import { startPaymentFake, type PaymentFake } from '@/lib/fakes/payment/server';
import { startSmtpFake, type SmtpFake, type StoredMessage } from '@/lib/fakes/smtp/server';
import { apiRequest, call, sessionCookie, TEST_ORIGIN, useTestDatabase } from '../../support/test-db';
import * as webhookRoute from '@/app/api/webhooks/stripe/route';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';

export const API_KEY = 'sk_test_tropopass_billing_tests';
export const WEBHOOK_SECRET = 'whsec_tropopass_billing_tests';

/** A small direct-EI flight: cheap to screen, valid for the engine. */
export const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 370 },
  fuelBurnKg: 40_000,
  emission: { eiNoxGPerKg: 14 },
  month: 6,
};

export interface BillingHarness {
  fake: PaymentFake;
  smtp: SmtpFake;
  /** The SDK pointed at the fake, for reading what the payment service holds. */
  sdk: Stripe;
  /** Webhook deliveries the bridge passed to the app's route, with the route's status. */
  deliveries: { type: string; status: number }[];
  control<T>(
    pathname: string,
    body?: unknown,
    method?: 'GET' | 'POST' | 'DELETE',
  ): Promise<{ status: number; body: T }>;
  mailsTo(address: string): StoredMessage[];
}

/**
 * Starts the local payment fake (random port, its own SQLite file), the SMTP fake and a bridge that
 * hands the fake's signed webhooks to the app's real route handler, then gives the test file its own
 * database with the app pointed at them. Call at the top level of a test file, instead of useTestDatabase.
 */
export function useBillingHarness(extraEnv: Record<string, string> = {}): BillingHarness {
  const env: Record<string, string> = { ...extraEnv };
  const h = { deliveries: [] as { type: string; status: number }[] } as BillingHarness;
  let dir = '';
  let bridge: http.Server | null = null;

  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-billing-'));
    bridge = http.createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (c: Buffer) => chunks.push(c));
      req.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const headers: Record<string, string> = { 'content-type': 'application/json' };
        const sig = req.headers['stripe-signature'];
        if (typeof sig === 'string') headers['stripe-signature'] = sig;
        void call(webhookRoute.POST, apiRequest('POST', '/api/webhooks/stripe', { rawBody: raw, headers })).then(
          (r) => {
            let type = 'unknown';
            try {
              type = (JSON.parse(raw) as { type: string }).type;
            } catch {
              /* not JSON */
            }
            h.deliveries.push({ type, status: r.status });
            res.writeHead(r.status, { 'content-type': 'application/json' }).end(JSON.stringify(r.body));
          },
          () => res.writeHead(500).end(),
        );
      });
    });
    await new Promise<void>((resolve) => bridge?.listen(0, '127.0.0.1', resolve));
    const bridgeUrl = `http://127.0.0.1:${(bridge.address() as AddressInfo).port}/api/webhooks/stripe`;
    h.fake = await startPaymentFake({
      port: 0,
      dbFile: path.join(dir, 'payment-fake.sqlite'),
      webhookUrl: bridgeUrl,
      webhookSecret: WEBHOOK_SECRET,
      apiKey: API_KEY,
      webhookRetryDelaysMs: [50, 100, 200],
    });
    h.smtp = await startSmtpFake({ smtpPort: 0, httpPort: 0 });
    h.sdk = new Stripe(API_KEY, { host: '127.0.0.1', port: h.fake.port, protocol: 'http', maxNetworkRetries: 0 });
    h.control = async <T>(
      pathname: string,
      body?: unknown,
      method: 'GET' | 'POST' | 'DELETE' = body === undefined ? 'GET' : 'POST',
    ) => {
      const res = await fetch(`${h.fake.url}${pathname}`, {
        method,
        headers: body === undefined ? {} : { 'content-type': 'application/json' },
        body: body === undefined ? undefined : JSON.stringify(body),
      });
      return { status: res.status, body: (await res.json()) as T };
    };
    h.mailsTo = (address) =>
      h.smtp.messages().filter((m) => m.to.some((t) => t.toLowerCase() === address.toLowerCase()));
    Object.assign(env, {
      STRIPE_SECRET_KEY: API_KEY,
      STRIPE_API_HOST: '127.0.0.1',
      STRIPE_API_PORT: String(h.fake.port),
      STRIPE_API_PROTOCOL: 'http',
      STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(h.smtp.smtpPort),
      RATE_LIMIT_API_PER_MIN: '100000',
      ...extraEnv,
    });
  });
  useTestDatabase(env);
  afterAll(async () => {
    await h.fake?.close();
    await h.smtp?.close();
    if (bridge) {
      bridge.closeAllConnections();
      await new Promise<void>((resolve) => bridge?.close(() => resolve()));
    }
    fs.rmSync(dir, { recursive: true, force: true });
  });
  return h;
}

export async function screen(slug: string, userId: number, body: unknown = FLIGHT) {
  const cookie = await sessionCookie(userId);
  return call<{ id: number }>(
    screeningsRoute.POST,
    apiRequest('POST', `/api/v1/workspaces/${slug}/screenings`, { cookie, body, origin: TEST_ORIGIN }),
    { slug },
  );
}

/** A body signed the way the payment service signs its webhooks. */
export function signedWebhook(payload: string, secret = WEBHOOK_SECRET): Request {
  const header = Stripe.webhooks.generateTestHeaderString({ payload, secret });
  return apiRequest('POST', '/api/webhooks/stripe', {
    rawBody: payload,
    headers: { 'content-type': 'application/json', 'stripe-signature': header },
  });
}

export async function until<T>(
  fn: () => Promise<T | null | undefined | false>,
  what: string,
  timeoutMs = 10_000,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}
