import { invalidRequest } from './errors';
import type { Params } from './form';
import type { ObjectKind, FakeStore, Page } from './store';
import type { EventObject, FakeEvent, FakeList, WebhookEventType } from './types';

export interface ApiContext {
  store: FakeStore;
  /** Seconds since the epoch, fixed for the whole request. */
  now: number;
  baseUrl: string;
  requestId: string | null;
  idempotencyKey: string | null;
  apiVersion: string;
  /** Records a webhook event in the same transaction; it is sent once the transaction commits. */
  emit(type: WebhookEventType, object: EventObject, previous?: Record<string, unknown>): FakeEvent;
  /** Test-card tokens already turned into payment methods during this request, token -> id. */
  attachedTokens: Map<string, string>;
}

/** A handler result that is not a plain 200: its status is kept, and stored for idempotent replay. */
export class Reply {
  constructor(
    readonly status: number,
    readonly body: unknown,
  ) {}
}

export type Handler = (ctx: ApiContext, params: Params, pathParams: string[]) => unknown;

export const PAGE_PARAMS = ['limit', 'starting_after', 'ending_before', 'expand'] as const;

export function readPage(params: Params): Page {
  const limit = params.int('limit', { min: 1, max: 100 }) ?? 10;
  const startingAfter = params.str('starting_after') || undefined;
  const endingBefore = params.str('ending_before') || undefined;
  if (startingAfter && endingBefore) {
    throw invalidRequest(
      'You may only specify one of these parameters: starting_after, ending_before.',
      'starting_after',
    );
  }
  return { limit, startingAfter, endingBefore };
}

export function listBody<T>(url: string, data: T[], hasMore: boolean): FakeList<T> {
  return { object: 'list', data, has_more: hasMore, url };
}

/** Top-level fields whose value changed, with their old values: an event's `previous_attributes`. */
export function previousAttributes(before: object, after: object): Record<string, unknown> {
  const prev: Record<string, unknown> = {};
  const a = before as Record<string, unknown>;
  const b = after as Record<string, unknown>;
  for (const key of new Set([...Object.keys(a), ...Object.keys(b)])) {
    if (JSON.stringify(a[key]) !== JSON.stringify(b[key])) prev[key] = a[key] ?? null;
  }
  return prev;
}

export function clone<T>(value: T): T {
  return structuredClone(value);
}

/** Adds whole calendar months in UTC, clamping the day (Jan 31 + 1 month -> Feb 28/29). */
export function addInterval(fromSeconds: number, interval: 'day' | 'week' | 'month' | 'year', count: number): number {
  if (interval === 'day') return fromSeconds + count * 86_400;
  if (interval === 'week') return fromSeconds + count * 7 * 86_400;
  const months = interval === 'year' ? 12 * count : count;
  const d = new Date(fromSeconds * 1000);
  const day = d.getUTCDate();
  const target = new Date(d.getTime());
  target.setUTCDate(1);
  target.setUTCMonth(target.getUTCMonth() + months);
  const lastDay = new Date(Date.UTC(target.getUTCFullYear(), target.getUTCMonth() + 1, 0)).getUTCDate();
  target.setUTCDate(Math.min(day, lastDay));
  return Math.floor(target.getTime() / 1000);
}

/** Which stored kind an expandable field names. */
const EXPANDABLE: Record<string, ObjectKind> = {
  customer: 'customer',
  default_payment_method: 'payment_method',
  latest_invoice: 'invoice',
  invoice: 'invoice',
  subscription: 'subscription',
  product: 'product',
  price: 'price',
  default_price: 'price',
  meter: 'meter',
};

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** `expand[]` paths such as `latest_invoice`, `customer`, `items.data.price.product`, `data.customer`. */
export function applyExpand(store: FakeStore, body: unknown, paths: string[]): unknown {
  const expandAt = (node: unknown, segments: string[], full: string): unknown => {
    if (Array.isArray(node)) return node.map((item) => expandAt(item, segments, full));
    if (!isRecord(node) || segments.length === 0) return node;
    const [head, ...rest] = segments;
    const value = node[head];
    if (value === undefined || value === null) return node;
    if (rest.length === 0) {
      if (typeof value !== 'string') return node;
      const kind = EXPANDABLE[head];
      if (!kind) throw invalidRequest(`This property cannot be expanded (${full}).`, 'expand');
      const found = store.get(kind, value);
      if (found) node[head] = found;
      return node;
    }
    if (typeof value === 'string') {
      const kind = EXPANDABLE[head];
      const found = kind ? store.get(kind, value) : undefined;
      if (!found) throw invalidRequest(`This property cannot be expanded (${full}).`, 'expand');
      node[head] = expandAt(clone(found), rest, full);
      return node;
    }
    node[head] = expandAt(value, rest, full);
    return node;
  };
  let out = body;
  for (const p of paths) out = expandAt(out, p.split('.'), p);
  return out;
}

/**
 * Hosted invoice and PDF links point at this fake; they are filled in on the way out so they follow
 * the port the fake runs on now.
 */
export function decorate<T>(body: T, baseUrl: string): T {
  const visit = (node: unknown): void => {
    if (Array.isArray(node)) {
      for (const item of node) visit(item);
      return;
    }
    if (!isRecord(node)) return;
    if (node.object === 'invoice' && typeof node.id === 'string' && !node.id.startsWith('upcoming_')) {
      node.hosted_invoice_url = `${baseUrl}/_fake/invoices/${node.id}`;
      node.invoice_pdf = `${baseUrl}/_fake/invoices/${node.id}/pdf`;
    }
    for (const value of Object.values(node)) visit(value);
  };
  visit(body);
  return body;
}

/** An amount as the hosted invoice pages show it: `12345, 'usd'` -> `$123.45`, other currencies by code. */
export function formatMoney(cents: number, currency: string): string {
  if (currency !== 'usd') return `${(cents / 100).toFixed(2)} ${currency.toUpperCase()}`;
  const abs = Math.abs(Math.round(cents));
  return `${cents < 0 ? '-' : ''}$${Math.floor(abs / 100).toLocaleString('en-US')}.${String(abs % 100).padStart(2, '0')}`;
}
