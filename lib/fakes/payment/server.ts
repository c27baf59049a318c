import { createHash } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import Stripe from 'stripe';
import { advanceSubscription, needsSecondBoundary } from './billing';
import { ensureCatalogue } from './catalogue';
import { Reply, applyExpand, clone, decorate, type ApiContext } from './common';
import { FakeApiError, authenticationError, invalidRequest, unknownRoute, type ApiErrorBody } from './errors';
import { Faults, NO_FAULTS, type FaultConfig } from './faults';
import { Params, fromJson, parseForm, type ParamObject } from './form';
import { newId } from './ids';
import { renderInvoiceHtml, renderInvoicePdf } from './invoice-document';
import { matchRoute } from './routes';
import { FakeStore, type DeliveryRecord, type DeliveryStatus } from './store';
import type {
  FakeCustomer,
  FakeEvent,
  FakeInvoice,
  FakeMeter,
  FakeMeterEvent,
  FakePaymentMethod,
  FakePrice,
  FakeProduct,
  FakeSubscription,
} from './types';
import { WebhookDispatcher, type DeliveryResult, type WebhookTarget } from './webhooks';

export const DEFAULT_PORT = 12111;
export const DEFAULT_DB_FILE = '.data/payment-fake.sqlite';
// Long enough to ride out a dev server that is still compiling its webhook route.
const DEFAULT_RETRY_DELAYS_MS = [1_000, 2_000, 4_000, 8_000, 16_000, 30_000];
const BODY_LIMIT_BYTES = 1_000_000;
const IDEMPOTENCY_TTL_SECONDS = 86_400;
const LOCAL_WEBHOOK_SECRET = 'whsec_tropopass_local_fake';

export interface PaymentFakeOptions {
  /** 0 picks a free port. Default 12111. */
  port?: number;
  /** SQLite file holding all state; created if missing. Default `.data/payment-fake.sqlite`. */
  dbFile?: string;
  /** Where signed webhook events go; without it (or without a secret) events are recorded, not sent. */
  webhookUrl?: string | null;
  webhookSecret?: string | null;
  /** The one secret key accepted; without it any `sk_test_...` key is. */
  apiKey?: string;
  /** Waits between webhook retries; its length is the number of retries. Default 1, 2, 4, 8, 16, 30 s. */
  webhookRetryDelaysMs?: number[];
  webhookTimeoutMs?: number;
  /** The fake's clock in seconds since the epoch (meter-event windows, periods). Default: real time. */
  now?: () => number;
  log?: (message: string) => void;
}

export interface MeterEventRecord extends FakeMeterEvent {
  meter: string;
  customer: string;
  value: number;
  invoice: string | null;
}

export interface FakeState {
  customers: FakeCustomer[];
  paymentMethods: FakePaymentMethod[];
  products: FakeProduct[];
  prices: FakePrice[];
  meters: FakeMeter[];
  subscriptions: FakeSubscription[];
  invoices: FakeInvoice[];
  meterEvents: MeterEventRecord[];
  events: { id: string; type: string; created: number; deliveryStatus: DeliveryStatus }[];
  deliveries: DeliveryRecord[];
  faults: FaultConfig & { matched: number; injected: number };
  idempotencyKeys: number;
  webhookUrl: string | null;
}

export interface PaymentFake {
  /** `http://127.0.0.1:<port>` */
  url: string;
  port: number;
  dbFile: string;
  close(): Promise<void>;
  reset(): void;
  setFaults(config: Partial<FaultConfig>): FaultConfig;
  clearFaults(): void;
  /** Same as `POST /_fake/advance`. */
  advance(subscriptionId: string): Promise<{ subscription: FakeSubscription; invoice: FakeInvoice }>;
  resendWebhook(eventId: string): Promise<DeliveryResult>;
  setWebhookTarget(target: Partial<WebhookTarget>): void;
  /** Resolves when every webhook attempt so far has finished and no retry is waiting. */
  webhooksIdle(): Promise<void>;
  state(): FakeState;
}

interface JsonReply {
  status: number;
  body: unknown;
  headers?: Record<string, string>;
}

function errorReply(error: FakeApiError): JsonReply {
  return { status: error.status, body: { error: error.body } };
}

function readBody(req: http.IncomingMessage): Promise<string | null> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size <= BODY_LIMIT_BYTES) chunks.push(chunk);
    });
    req.on('end', () => resolve(size > BODY_LIMIT_BYTES ? null : Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

function isLoopback(address: string | undefined): boolean {
  return address === '127.0.0.1' || address === '::1' || address === '::ffff:127.0.0.1';
}

function header(req: http.IncomingMessage, name: string): string | undefined {
  const v = req.headers[name];
  return Array.isArray(v) ? v[0] : v;
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

// Control-endpoint JSON helpers: small and strict, so a typo in a test shows as a 400.

function jsonObject(raw: string): Record<string, unknown> {
  if (raw.trim() === '') return {};
  let parsed: unknown;
  try {
    parsed = JSON.parse(raw);
  } catch {
    throw invalidRequest('The body must be JSON.');
  }
  if (typeof parsed !== 'object' || parsed === null || Array.isArray(parsed))
    throw invalidRequest('The body must be a JSON object.');
  return parsed as Record<string, unknown>;
}

function onlyKeys(body: Record<string, unknown>, allowed: string[]): void {
  for (const key of Object.keys(body)) {
    if (!allowed.includes(key)) throw invalidRequest(`Unknown field: ${key}`, key);
  }
}

function optionalNumber(body: Record<string, unknown>, key: string, min: number, max: number): number | undefined {
  const v = body[key];
  if (v === undefined) return undefined;
  if (typeof v !== 'number' || !Number.isFinite(v) || v < min || v > max) {
    throw invalidRequest(`${key} must be a number in ${min}..${max}`, key);
  }
  return v;
}

function requiredString(body: Record<string, unknown>, key: string): string {
  const v = body[key];
  if (typeof v !== 'string' || v === '') throw invalidRequest(`${key} is required`, key);
  return v;
}

function faultConfigFrom(body: Record<string, unknown>): FaultConfig {
  onlyKeys(body, ['failRate', 'status', 'delayMs', 'onlyPaths', 'failNext', 'seed']);
  const status = body.status ?? 500;
  if (status !== 500 && status !== 429) throw invalidRequest('status must be 500 or 429', 'status');
  const onlyPaths = body.onlyPaths;
  if (
    onlyPaths !== undefined &&
    onlyPaths !== null &&
    !(Array.isArray(onlyPaths) && onlyPaths.every((p) => typeof p === 'string'))
  ) {
    throw invalidRequest('onlyPaths must be an array of path prefixes', 'onlyPaths');
  }
  return {
    failRate: optionalNumber(body, 'failRate', 0, 1) ?? 0,
    status,
    delayMs: optionalNumber(body, 'delayMs', 0, 60_000) ?? 0,
    onlyPaths: Array.isArray(onlyPaths) ? (onlyPaths as string[]) : null,
    failNext: optionalNumber(body, 'failNext', 0, 1_000_000) ?? 0,
    seed: optionalNumber(body, 'seed', 0, 2 ** 32) ?? null,
  };
}

/** What every part of a running fake shares. `baseUrl` is known once the server listens. */
interface FakeCore {
  store: FakeStore;
  faults: Faults;
  dispatcher: WebhookDispatcher;
  clock: () => number;
  log: (message: string) => void;
  apiKey: string | undefined;
  baseUrl: string;
}

function defaultApiVersion(core: FakeCore): string {
  return core.store.getMeta('api_version') ?? Stripe.API_VERSION;
}

/** Runs `fn` in one transaction with a context whose events are sent only after it commits. */
function inTransaction<T>(
  core: FakeCore,
  request: { requestId: string | null; idempotencyKey: string | null; apiVersion: string },
  fn: (ctx: ApiContext) => T,
): T {
  const emitted: string[] = [];
  const now = core.clock();
  const ctx: ApiContext = {
    store: core.store,
    now,
    baseUrl: core.baseUrl,
    requestId: request.requestId,
    idempotencyKey: request.idempotencyKey,
    apiVersion: request.apiVersion,
    attachedTokens: new Map(),
    emit(type, object, previous) {
      const event: FakeEvent = {
        id: newId('evt'),
        object: 'event',
        api_version: request.apiVersion,
        created: now,
        data: { object: decorate(clone(object), core.baseUrl) },
        livemode: false,
        pending_webhooks: core.dispatcher.enabled ? 1 : 0,
        request: { id: request.requestId, idempotency_key: request.idempotencyKey },
        type,
      };
      if (previous && Object.keys(previous).length > 0) event.data.previous_attributes = previous;
      core.store.insertEvent(event, core.dispatcher.enabled ? 'pending' : 'skipped');
      emitted.push(event.id);
      return event;
    },
  };
  const result = core.store.tx(() => fn(ctx));
  core.dispatcher.enqueue(emitted);
  return result;
}

function authenticate(core: FakeCore, req: http.IncomingMessage): FakeApiError | null {
  const auth = header(req, 'authorization');
  if (!auth) {
    return authenticationError(
      'You did not provide an API key. Provide it in the Authorization header, using Bearer auth (Authorization: Bearer YOUR_SECRET_KEY).',
    );
  }
  const bearer = /^Bearer (.+)$/.exec(auth);
  const basic = /^Basic (.+)$/.exec(auth);
  const key = bearer?.[1] ?? (basic ? Buffer.from(basic[1], 'base64').toString('utf8').split(':')[0] : '');
  const ok = core.apiKey ? key === core.apiKey : key.startsWith('sk_test_') && key.length > 'sk_test_'.length;
  if (!ok) {
    const shown = key.length > 4 ? `${key.slice(0, 8)}****${key.slice(-4)}` : '****';
    return authenticationError(`Invalid API Key provided: ${shown}`);
  }
  return null;
}

async function handleApi(
  core: FakeCore,
  req: http.IncomingMessage,
  url: URL,
  raw: string,
  requestId: string,
): Promise<JsonReply> {
  const method = req.method ?? 'GET';
  const authError = authenticate(core, req);
  if (authError) return errorReply(authError);

  const decision = core.faults.decide(url.pathname);
  if (decision.delayMs > 0) await sleep(decision.delayMs);
  if (decision.failWith === 500) {
    return errorReply(
      new FakeApiError(500, {
        type: 'api_error',
        message: 'An unexpected error occurred (injected by the payment fake).',
      }),
    );
  }
  if (decision.failWith === 429) {
    return errorReply(
      new FakeApiError(429, {
        type: 'rate_limit_error',
        code: 'rate_limit',
        message: 'Request rate limit exceeded (injected by the payment fake).',
      }),
    );
  }

  const inQuery = method === 'GET' || method === 'DELETE';
  let values: ParamObject;
  const contentType = header(req, 'content-type') ?? '';
  if (inQuery) {
    values = parseForm(url.search.slice(1));
    if (method === 'DELETE' && raw) Object.assign(values, parseForm(raw));
  } else if (contentType.includes('application/json')) {
    try {
      values = fromJson(JSON.parse(raw || '{}'));
    } catch {
      return errorReply(invalidRequest('Invalid JSON body.'));
    }
  } else {
    values = parseForm(raw);
  }

  const match = matchRoute(method, url.pathname);
  if (match === null || match === 'method') return errorReply(unknownRoute(method, url.pathname));

  const headerVersion = header(req, 'stripe-version');
  const apiVersion = headerVersion ?? defaultApiVersion(core);
  const idempotencyKey = method === 'POST' ? (header(req, 'idempotency-key') ?? null) : null;
  const bodyHash = createHash('sha256')
    .update(`${method} ${url.pathname}\n${inQuery ? url.search : raw}`)
    .digest('hex');
  const common = { 'Stripe-Version': apiVersion, ...(idempotencyKey ? { 'Idempotency-Key': idempotencyKey } : {}) };

  if (idempotencyKey) {
    const existing = core.store.getIdempotency(idempotencyKey);
    if (existing) {
      if (existing.method !== method || existing.path !== url.pathname || existing.bodyHash !== bodyHash) {
        return errorReply(
          new FakeApiError(400, {
            type: 'idempotency_error',
            message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`,
          }),
        );
      }
      return {
        status: existing.status,
        body: decorate(JSON.parse(existing.response) as unknown, core.baseUrl),
        headers: { ...common, 'Idempotent-Replayed': 'true' },
      };
    }
  }

  try {
    const reply = inTransaction(core, { requestId, idempotencyKey, apiVersion }, (ctx) => {
      if (headerVersion) core.store.setMeta('api_version', headerVersion);
      const params = new Params(values);
      const result = match.route.handler(ctx, params, match.params);
      const out = result instanceof Reply ? result : new Reply(200, result);
      let body = out.body;
      const expand = params.strList('expand');
      if (expand && out.status === 200) body = applyExpand(core.store, clone(body), expand);
      body = decorate(body, core.baseUrl);
      if (idempotencyKey) {
        core.store.putIdempotency({
          key: idempotencyKey,
          method,
          path: url.pathname,
          bodyHash,
          status: out.status,
          response: JSON.stringify(body),
          created: ctx.now,
        });
      }
      return { status: out.status, body };
    });
    return { ...reply, headers: common };
  } catch (err) {
    if (err instanceof FakeApiError) return { ...errorReply(err), headers: common };
    core.log(
      `payment fake: ${method} ${url.pathname} failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`,
    );
    return {
      status: 500,
      body: { error: { type: 'api_error', message: 'The payment fake failed to handle this request.' } },
    };
  }
}

function fakeState(core: FakeCore): FakeState {
  return {
    customers: core.store.all('customer'),
    paymentMethods: core.store.all('payment_method'),
    products: core.store.all('product'),
    prices: core.store.all('price'),
    meters: core.store.all('meter'),
    subscriptions: core.store.all('subscription'),
    invoices: decorate(core.store.all('invoice'), core.baseUrl),
    meterEvents: core.store
      .allMeterEvents()
      .map((m) => ({ ...m.event, meter: m.meter, customer: m.customer, value: m.value, invoice: m.invoice })),
    events: core.store.allEvents().map((e) => ({
      id: e.event.id,
      type: e.event.type,
      created: e.event.created,
      deliveryStatus: e.deliveryStatus,
    })),
    deliveries: core.store.deliveries(),
    faults: { ...core.faults.current, matched: core.faults.matched, injected: core.faults.injected },
    idempotencyKeys: core.store.countIdempotency(),
    webhookUrl: core.dispatcher.url,
  };
}

async function advance(
  core: FakeCore,
  subscription: string,
): Promise<{ subscription: FakeSubscription; invoice: FakeInvoice }> {
  // Meter timestamps are whole seconds: when usage is already stamped with the current second, close
  // at the next one so that second's usage lands wholly in the period being closed.
  const waitUntil = Date.now() + 1_200;
  for (
    let t = core.clock();
    needsSecondBoundary({ store: core.store }, subscription, t) && Date.now() < waitUntil;
    t = core.clock()
  ) {
    while (core.clock() === t && Date.now() < waitUntil) await sleep(15);
  }
  return inTransaction(core, { requestId: null, idempotencyKey: null, apiVersion: defaultApiVersion(core) }, (ctx) => {
    const result = advanceSubscription(ctx, subscription);
    return decorate(result, core.baseUrl);
  });
}

function resetFake(core: FakeCore): void {
  core.store.reset();
  core.faults.reset();
  ensureCatalogue(core.store, core.clock());
}

async function handleControl(
  core: FakeCore,
  req: http.IncomingMessage,
  res: http.ServerResponse,
  url: URL,
  raw: string,
): Promise<JsonReply | null> {
  const method = req.method ?? 'GET';
  const p = url.pathname;
  const invoicePage = /^\/_fake\/invoices\/([^/]+)(\/pdf)?$/.exec(p);
  if (method === 'GET' && invoicePage) {
    const invoice = core.store.get('invoice', decodeURIComponent(invoicePage[1]));
    if (!invoice) return errorReply(unknownRoute(method, p));
    const decorated = decorate(clone(invoice), core.baseUrl);
    if (invoicePage[2]) {
      const pdf = renderInvoicePdf(decorated);
      res.writeHead(200, {
        'Content-Type': 'application/pdf',
        'Content-Length': String(pdf.length),
        'Content-Disposition': `inline; filename="${invoice.number ?? invoice.id}.pdf"`,
      });
      res.end(pdf);
    } else {
      const html = renderInvoiceHtml(decorated);
      res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8' });
      res.end(html);
    }
    return null;
  }
  const route = `${method} ${p}`;
  switch (route) {
    case 'GET /_fake/health':
      return { status: 200, body: { ok: true, url: core.baseUrl } };
    case 'GET /_fake/state':
      return { status: 200, body: fakeState(core) };
    case 'POST /_fake/reset':
      resetFake(core);
      return { status: 200, body: { ok: true } };
    case 'GET /_fake/faults':
      return { status: 200, body: core.faults.current };
    case 'POST /_fake/faults':
      core.faults.set(faultConfigFrom(jsonObject(raw)));
      return { status: 200, body: core.faults.current };
    case 'DELETE /_fake/faults':
    case 'POST /_fake/faults/reset':
      core.faults.reset();
      return { status: 200, body: core.faults.current };
    case 'POST /_fake/advance': {
      const body = jsonObject(raw);
      onlyKeys(body, ['subscription', 'wait']);
      const result = await advance(core, requiredString(body, 'subscription'));
      if (body.wait === true) await core.dispatcher.idle();
      return { status: 200, body: result };
    }
    case 'GET /_fake/webhooks':
      return {
        status: 200,
        body: { url: core.dispatcher.url, events: fakeState(core).events, deliveries: core.store.deliveries() },
      };
    case 'POST /_fake/webhooks/resend': {
      const body = jsonObject(raw);
      onlyKeys(body, ['eventId']);
      const eventId = requiredString(body, 'eventId');
      if (!core.store.getEvent(eventId)) throw invalidRequest(`No such event: '${eventId}'`, 'eventId');
      return { status: 200, body: await core.dispatcher.resend(eventId) };
    }
    case 'POST /_fake/webhooks/config': {
      const body = jsonObject(raw);
      onlyKeys(body, ['url', 'secret']);
      const target: Partial<WebhookTarget> = {};
      if (body.url !== undefined) {
        if (body.url !== null && typeof body.url !== 'string')
          throw invalidRequest('url must be a string or null', 'url');
        target.url = body.url;
      }
      if (body.secret !== undefined) target.secret = requiredString(body, 'secret');
      core.dispatcher.setTarget(target);
      return { status: 200, body: { url: core.dispatcher.url } };
    }
    case 'POST /_fake/webhooks/wait':
      await core.dispatcher.idle();
      return { status: 200, body: { ok: true } };
    default:
      return errorReply(unknownRoute(method, p));
  }
}

/** Answers one request: the `/v1` API, the loopback-only `/_fake` controls, or an error. */
async function handleRequest(core: FakeCore, req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
  const requestId = newId('req', 14);
  let reply: JsonReply | null;
  try {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    const raw = await readBody(req);
    if (raw === null) {
      reply = errorReply(new FakeApiError(413, { type: 'invalid_request_error', message: 'Request body too large.' }));
    } else if (url.pathname.startsWith('/_fake/')) {
      reply = isLoopback(req.socket.remoteAddress)
        ? await handleControl(core, req, res, url, raw)
        : errorReply(
            new FakeApiError(403, {
              type: 'invalid_request_error',
              message: 'Control endpoints are loopback only.',
            }),
          );
    } else if (url.pathname.startsWith('/v1/')) {
      reply = await handleApi(core, req, url, raw, requestId);
    } else {
      reply = errorReply(unknownRoute(req.method ?? 'GET', url.pathname));
    }
  } catch (err) {
    if (err instanceof FakeApiError) reply = errorReply(err);
    else {
      core.log(`payment fake: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
      reply = {
        status: 500,
        body: { error: { type: 'api_error', message: 'The payment fake failed.' } satisfies ApiErrorBody },
      };
    }
  }
  if (reply === null || res.headersSent) return;
  const json = JSON.stringify(reply.body);
  res.writeHead(reply.status, {
    'Content-Type': 'application/json',
    'Content-Length': String(Buffer.byteLength(json)),
    'Request-Id': requestId,
    'Cache-Control': 'no-store',
    ...reply.headers,
  });
  res.end(json);
}

/**
 * Starts the local payment fake: the `/v1` API the `stripe` SDK calls (with
 * `host: '127.0.0.1', port, protocol: 'http'`), signed webhooks to `webhookUrl`, and the `/_fake`
 * control endpoints for tests.
 */
export async function startPaymentFake(options: PaymentFakeOptions = {}): Promise<PaymentFake> {
  const dbFile = options.dbFile ?? DEFAULT_DB_FILE;
  const log = options.log ?? (() => undefined);
  const clock = options.now ?? (() => Math.floor(Date.now() / 1000));
  const store = new FakeStore(dbFile);
  store.db.prepare(`DELETE FROM idempotency WHERE created < ?`).run(clock() - IDEMPOTENCY_TTL_SECONDS);
  ensureCatalogue(store, clock());

  const faults = new Faults();
  const dispatcher = new WebhookDispatcher(
    store,
    { url: options.webhookUrl ?? null, secret: options.webhookSecret ?? null },
    {
      retryDelaysMs: options.webhookRetryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS,
      timeoutMs: options.webhookTimeoutMs ?? 10_000,
      log,
    },
  );
  const core: FakeCore = { store, faults, dispatcher, clock, log, apiKey: options.apiKey, baseUrl: '' };

  const server = http.createServer((req, res) => {
    void handleRequest(core, req, res);
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? DEFAULT_PORT, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;
  core.baseUrl = `http://127.0.0.1:${port}`;
  dispatcher.enqueue(store.eventIdsWithStatus('pending'));

  let closing: Promise<void> | null = null;
  return {
    url: core.baseUrl,
    port,
    dbFile,
    close() {
      closing ??= (async () => {
        await dispatcher.close();
        await new Promise<void>((resolve) => {
          server.close(() => resolve());
          server.closeAllConnections();
        });
        store.close();
      })();
      return closing;
    },
    reset: () => resetFake(core),
    setFaults(config) {
      faults.set({ ...NO_FAULTS, ...config });
      return faults.current;
    },
    clearFaults() {
      faults.reset();
    },
    advance: (subscription) => advance(core, subscription),
    resendWebhook: (eventId) => dispatcher.resend(eventId),
    setWebhookTarget: (target) => dispatcher.setTarget(target),
    webhooksIdle: () => dispatcher.idle(),
    state: () => fakeState(core),
  };
}

function isMain(): boolean {
  const entry = process.argv[1];
  return entry !== undefined && import.meta.url === pathToFileURL(path.resolve(entry)).href;
}

/**
 * `PAYMENT_FAKE_TODAY=YYYY-MM-DD` shifts the fake's clock by whole days so that date is "today" and time
 * keeps running, for a demo whose app pins its own date.
 */
function clockFromEnv(today: string | undefined): (() => number) | undefined {
  if (!today) return undefined;
  if (!/^\d{4}-\d{2}-\d{2}$/.test(today)) {
    console.error('payment fake: PAYMENT_FAKE_TODAY must be YYYY-MM-DD');
    process.exit(1);
  }
  const realMidnight = Math.floor(Date.now() / 86_400_000) * 86_400;
  const offset = Date.parse(`${today}T00:00:00Z`) / 1000 - realMidnight;
  return () => Math.floor(Date.now() / 1000) + offset;
}

if (isMain()) {
  const port = Number(process.env.PAYMENT_FAKE_PORT ?? DEFAULT_PORT);
  const webhookUrl = process.env.PAYMENT_WEBHOOK_URL || null;
  // Same fallback as the app's lib/env.ts, so a demo that sets neither side still verifies.
  const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET || LOCAL_WEBHOOK_SECRET;
  if (webhookUrl && !process.env.STRIPE_WEBHOOK_SECRET) {
    console.error(
      `payment fake: STRIPE_WEBHOOK_SECRET unset; signing webhooks with the local default ${LOCAL_WEBHOOK_SECRET}`,
    );
  }
  const fake = await startPaymentFake({
    port,
    dbFile: process.env.PAYMENT_FAKE_DB || DEFAULT_DB_FILE,
    webhookUrl,
    webhookSecret,
    apiKey: process.env.PAYMENT_FAKE_API_KEY || undefined,
    now: clockFromEnv(process.env.PAYMENT_FAKE_TODAY),
    log: (message) => console.error(message),
  });
  console.log(
    `payment fake listening on ${fake.url} (state: ${fake.dbFile}; webhooks: ${webhookUrl ?? 'off, no PAYMENT_WEBHOOK_URL'})`,
  );
  const stop = () => {
    void fake.close().then(() => process.exit(0));
  };
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}
