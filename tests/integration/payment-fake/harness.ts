import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { startPaymentFake, type PaymentFake, type PaymentFakeOptions } from '../../../lib/fakes/payment/server';

export const API_KEY = 'sk_test_tropopass_payment_fake_tests';
export const WEBHOOK_SECRET = 'whsec_tropopass_payment_fake_tests';

/** The SDK exactly as the app builds it: pointed at the fake, no retries of its own. */
export function sdkFor(fake: { port: number }, key = API_KEY): Stripe {
  return new Stripe(key, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 });
}

/**
 * Stands in for the app's webhook route: reads the raw body, verifies `Stripe-Signature` with the
 * SDK's `constructEvent`, answers 400 on a bad signature and `downStatus` while "down".
 */
export class WebhookReceiver {
  readonly events: Stripe.Event[] = [];
  rejected = 0;
  refused = 0;
  downStatus: number | null = null;
  private readonly verifier = new Stripe(API_KEY);
  private server: http.Server | null = null;
  url = '';

  constructor(private readonly secret: string) {}

  async start(): Promise<this> {
    this.server = http.createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (c: Buffer) => chunks.push(c));
      req.on('end', () => {
        if (this.downStatus !== null) {
          this.refused += 1;
          res.writeHead(this.downStatus).end();
          return;
        }
        const raw = Buffer.concat(chunks).toString('utf8');
        const signature = req.headers['stripe-signature'];
        try {
          const event = this.verifier.webhooks.constructEvent(
            raw,
            typeof signature === 'string' ? signature : '',
            this.secret,
          );
          this.events.push(event);
          res.writeHead(200, { 'Content-Type': 'application/json' }).end('{"received":true}');
        } catch {
          this.rejected += 1;
          res.writeHead(400).end('bad signature');
        }
      });
    });
    await new Promise<void>((resolve) => this.server?.listen(0, '127.0.0.1', resolve));
    this.url = `http://127.0.0.1:${(this.server.address() as AddressInfo).port}/api/webhooks/stripe`;
    return this;
  }

  ofType(type: string): Stripe.Event[] {
    return this.events.filter((e) => e.type === type);
  }

  /** Waits until an event matching `predicate` has arrived. */
  async waitFor(predicate: (event: Stripe.Event) => boolean, timeoutMs = 10_000): Promise<Stripe.Event> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const found = this.events.find(predicate);
      if (found) return found;
      if (Date.now() > deadline) {
        throw new Error(
          `no matching webhook within ${timeoutMs} ms; got: ${this.events.map((e) => e.type).join(', ')}`,
        );
      }
      await new Promise((resolve) => setTimeout(resolve, 20));
    }
  }

  async close(): Promise<void> {
    const server = this.server;
    if (!server) return;
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
  }
}

export interface Harness {
  fake: PaymentFake;
  stripe: Stripe;
  receiver: WebhookReceiver;
  dir: string;
  dbFile: string;
  /** Stops the fake and starts a new one on the same SQLite file (and a new port). */
  restart(): Promise<void>;
  /** POSTs JSON to a `/_fake/...` control endpoint. */
  control<T>(
    pathname: string,
    body?: unknown,
    method?: 'GET' | 'POST' | 'DELETE',
  ): Promise<{ status: number; body: T }>;
  close(): Promise<void>;
}

export async function startHarness(options: Partial<PaymentFakeOptions> = {}): Promise<Harness> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'payment-fake-'));
  const dbFile = path.join(dir, 'payment-fake.sqlite');
  const receiver = await new WebhookReceiver(WEBHOOK_SECRET).start();
  const fakeOptions: PaymentFakeOptions = {
    port: 0,
    dbFile,
    webhookUrl: receiver.url,
    webhookSecret: WEBHOOK_SECRET,
    apiKey: API_KEY,
    webhookRetryDelaysMs: [50, 100, 200],
    ...options,
  };
  const fake = await startPaymentFake(fakeOptions);
  const h: Harness = {
    fake,
    stripe: sdkFor(fake),
    receiver,
    dir,
    dbFile,
    async restart() {
      await h.fake.close();
      h.fake = await startPaymentFake(fakeOptions);
      h.stripe = sdkFor(h.fake);
    },
    async control<T>(
      pathname: string,
      body?: unknown,
      method: 'GET' | 'POST' | 'DELETE' = body === undefined ? 'GET' : 'POST',
    ) {
      const res = await fetch(`${h.fake.url}${pathname}`, {
        method,
        headers: body === undefined ? {} : { 'Content-Type': 'application/json' },
        body: body === undefined ? undefined : JSON.stringify(body),
      });
      return { status: res.status, body: (await res.json()) as T };
    },
    async close() {
      await h.fake.close();
      await receiver.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
  return h;
}

/** Catalogue prices by lookup key, through the SDK. */
export async function catalogue(stripe: Stripe): Promise<Map<string, Stripe.Price>> {
  const list = await stripe.prices.list({ limit: 100, active: true });
  return new Map(list.data.filter((p) => p.lookup_key !== null).map((p) => [p.lookup_key as string, p]));
}

/** A customer with a card attached and set as the default for invoices. */
export async function customerWithCard(
  stripe: Stripe,
  card: 'pm_card_visa' | 'pm_card_chargeDeclined',
  email = 'ops@example.test',
) {
  const customer = await stripe.customers.create({ email, name: 'Test Operator', metadata: { workspace: 'ws_test' } });
  const pm = await stripe.paymentMethods.attach(card, { customer: customer.id });
  await stripe.customers.update(customer.id, { invoice_settings: { default_payment_method: pm.id } });
  return { customer, paymentMethod: pm };
}
