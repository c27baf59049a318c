import Stripe from 'stripe';
import type { FakeStore } from './store';

export interface WebhookTarget {
  url: string | null;
  secret: string | null;
}

export interface DeliveryResult {
  eventId: string;
  attempt: number;
  delivered: boolean;
  status: number | null;
  error: string | null;
}

export interface WebhookOptions {
  /** Waits before each retry after a failed first attempt; its length is the number of retries. */
  retryDelaysMs: number[];
  timeoutMs: number;
  log: (message: string) => void;
}

/**
 * Sends recorded events to the app, signed with the SDK's own scheme so `webhooks.constructEvent`
 * accepts them. First attempts go out one at a time in the order the events happened; a failed event
 * is retried on its own timer so it does not hold up the ones behind it. Every attempt is recorded.
 */
export class WebhookDispatcher {
  private target: WebhookTarget;
  private chain: Promise<void> = Promise.resolve();
  private readonly timers = new Set<NodeJS.Timeout>();
  private readonly inflight = new Set<Promise<unknown>>();
  private closed = false;
  private readonly abort = new AbortController();

  constructor(
    private readonly store: FakeStore,
    target: WebhookTarget,
    private readonly options: WebhookOptions,
  ) {
    this.target = { ...target };
  }

  get url(): string | null {
    return this.target.url;
  }

  setTarget(target: Partial<WebhookTarget>): void {
    this.target = { ...this.target, ...target };
  }

  /** Whether a newly recorded event will be sent (otherwise it is stored as `skipped`). */
  get enabled(): boolean {
    return Boolean(this.target.url && this.target.secret);
  }

  /** Queues first attempts for events just committed, in order. */
  enqueue(eventIds: string[]): void {
    for (const id of eventIds) {
      const p = (this.chain = this.chain.then(async () => {
        await this.attemptAndMaybeRetry(id, 1);
      }));
      this.track(p);
    }
  }

  /** Sends an event again, now, whatever happened before; resolves with that attempt's outcome. */
  async resend(eventId: string): Promise<DeliveryResult> {
    const previous = this.store.deliveries(eventId).length;
    const p = this.attempt(eventId, previous + 1);
    this.track(p);
    const result = await p;
    if (result.delivered) this.store.setDeliveryStatus(eventId, 'delivered');
    return result;
  }

  /** Resolves when no attempt is in flight and no retry is waiting. */
  async idle(): Promise<void> {
    while (this.inflight.size > 0 || this.timers.size > 0) {
      if (this.inflight.size > 0) await Promise.allSettled([...this.inflight]);
      else await new Promise((resolve) => setTimeout(resolve, 10));
    }
  }

  /** Stops retries and aborts attempts in flight; events not yet delivered stay `pending`. */
  async close(): Promise<void> {
    this.closed = true;
    for (const t of this.timers) clearTimeout(t);
    this.timers.clear();
    this.abort.abort();
    await Promise.allSettled([...this.inflight]);
  }

  private track<T>(p: Promise<T>): void {
    this.inflight.add(p);
    void p.finally(() => this.inflight.delete(p)).catch(() => undefined);
  }

  private async attemptAndMaybeRetry(eventId: string, attempt: number): Promise<void> {
    if (this.closed) return;
    const result = await this.attempt(eventId, attempt);
    if (this.closed) return;
    if (result.delivered) {
      this.store.setDeliveryStatus(eventId, 'delivered');
      return;
    }
    if (result.error === 'no webhook target' || result.error === 'no such event') return;
    const delay = this.options.retryDelaysMs[attempt - 1];
    if (delay === undefined) {
      this.store.setDeliveryStatus(eventId, 'failed');
      this.options.log(`webhook ${eventId}: gave up after ${attempt} attempts`);
      return;
    }
    const timer = setTimeout(() => {
      this.timers.delete(timer);
      this.track(this.attemptAndMaybeRetry(eventId, attempt + 1));
    }, delay);
    this.timers.add(timer);
  }

  private async attempt(eventId: string, attempt: number): Promise<DeliveryResult> {
    const { url, secret } = this.target;
    const stored = this.store.getEvent(eventId);
    if (!stored) return { eventId, attempt, delivered: false, status: null, error: 'no such event' };
    if (!url || !secret || this.closed) {
      return { eventId, attempt, delivered: false, status: null, error: 'no webhook target' };
    }
    const payload = JSON.stringify(stored.event, null, 2);
    const header = Stripe.webhooks.generateTestHeaderString({ payload, secret });
    const started = Date.now();
    let status: number | null = null;
    let error: string | null = null;
    try {
      const res = await fetch(url, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json; charset=utf-8', 'Stripe-Signature': header },
        body: payload,
        signal: AbortSignal.any([AbortSignal.timeout(this.options.timeoutMs), this.abort.signal]),
      });
      status = res.status;
      await res.arrayBuffer().catch(() => undefined);
      if (!res.ok) error = `HTTP ${res.status}`;
    } catch (err) {
      error = err instanceof Error ? err.message : String(err);
    }
    const delivered = status !== null && status >= 200 && status < 300;
    if (!this.closed) {
      this.store.addDelivery({
        eventId,
        attempt,
        atMs: started,
        url,
        status,
        error,
        durationMs: Date.now() - started,
      });
    }
    return { eventId, attempt, delivered, status, error };
  }
}
