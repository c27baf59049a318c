import Database from 'better-sqlite3';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import type {
  AggregationFormula,
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

/** The fake's state, in its own SQLite file (WAL), so a restart of the fake loses nothing. */

export interface ObjectTypes {
  customer: FakeCustomer;
  payment_method: FakePaymentMethod;
  product: FakeProduct;
  price: FakePrice;
  meter: FakeMeter;
  subscription: FakeSubscription;
  invoice: FakeInvoice;
}
export type ObjectKind = keyof ObjectTypes;

export type CardBehavior = 'succeed' | 'decline';

/** State the API does not show, kept beside each object. */
export interface InternalTypes {
  customer: { deleted: boolean };
  payment_method: { behavior: CardBehavior };
  product: Record<string, never>;
  price: Record<string, never>;
  meter: Record<string, never>;
  subscription: Record<string, never>;
  invoice: Record<string, never>;
}

export interface Page {
  limit: number;
  startingAfter?: string;
  endingBefore?: string;
}

export interface ListFilter<T> {
  customer?: string;
  subscription?: string;
  lookupKeys?: string[];
  where?: (item: T) => boolean;
}

export interface StoredMeterEvent {
  event: FakeMeterEvent;
  meter: string;
  customer: string;
  value: number;
  invoice: string | null;
}

export interface IdempotencyRecord {
  key: string;
  method: string;
  path: string;
  bodyHash: string;
  status: number;
  response: string;
  created: number;
}

export type DeliveryStatus = 'pending' | 'delivered' | 'failed' | 'skipped';

export interface StoredEvent {
  event: FakeEvent;
  deliveryStatus: DeliveryStatus;
}

export interface DeliveryRecord {
  id: number;
  eventId: string;
  attempt: number;
  atMs: number;
  url: string;
  status: number | null;
  error: string | null;
  durationMs: number;
}

interface ObjectRow {
  seq: number;
  data: string;
  internal: string;
}

interface MeterEventRow {
  meter: string;
  customer: string;
  value: number;
  invoice: string | null;
  payload: string;
  identifier: string;
  event_name: string;
  timestamp: number;
  created: number;
}

const SCHEMA = `
CREATE TABLE IF NOT EXISTS objects (
  seq INTEGER PRIMARY KEY AUTOINCREMENT,
  id TEXT NOT NULL UNIQUE,
  kind TEXT NOT NULL,
  customer TEXT,
  subscription TEXT,
  lookup_key TEXT,
  created INTEGER NOT NULL,
  data TEXT NOT NULL,
  internal TEXT NOT NULL DEFAULT '{}'
);
CREATE INDEX IF NOT EXISTS objects_kind_customer ON objects (kind, customer);
CREATE INDEX IF NOT EXISTS objects_kind_subscription ON objects (kind, subscription);
CREATE INDEX IF NOT EXISTS objects_kind_lookup_key ON objects (kind, lookup_key);
CREATE TABLE IF NOT EXISTS meter_events (
  seq INTEGER PRIMARY KEY AUTOINCREMENT,
  identifier TEXT NOT NULL UNIQUE,
  event_name TEXT NOT NULL,
  meter TEXT NOT NULL,
  customer TEXT NOT NULL,
  value INTEGER NOT NULL,
  timestamp INTEGER NOT NULL,
  created INTEGER NOT NULL,
  payload TEXT NOT NULL,
  invoice TEXT
);
CREATE INDEX IF NOT EXISTS meter_events_window ON meter_events (meter, customer, timestamp);
CREATE TABLE IF NOT EXISTS idempotency (
  key TEXT PRIMARY KEY,
  method TEXT NOT NULL,
  path TEXT NOT NULL,
  body_hash TEXT NOT NULL,
  status INTEGER NOT NULL,
  response TEXT NOT NULL,
  created INTEGER NOT NULL
);
CREATE TABLE IF NOT EXISTS events (
  seq INTEGER PRIMARY KEY AUTOINCREMENT,
  id TEXT NOT NULL UNIQUE,
  type TEXT NOT NULL,
  created INTEGER NOT NULL,
  data TEXT NOT NULL,
  delivery_status TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS webhook_deliveries (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  event_id TEXT NOT NULL,
  attempt INTEGER NOT NULL,
  at_ms INTEGER NOT NULL,
  url TEXT NOT NULL,
  status INTEGER,
  error TEXT,
  duration_ms INTEGER NOT NULL
);
CREATE INDEX IF NOT EXISTS webhook_deliveries_event ON webhook_deliveries (event_id);
CREATE TABLE IF NOT EXISTS meta (
  key TEXT PRIMARY KEY,
  value TEXT NOT NULL
);
`;

function indexColumns(
  kind: ObjectKind,
  obj: ObjectTypes[ObjectKind],
): {
  customer: string | null;
  subscription: string | null;
  lookup_key: string | null;
} {
  const customer = 'customer' in obj && typeof obj.customer === 'string' ? obj.customer : null;
  let subscription: string | null = null;
  let lookupKey: string | null = null;
  if (kind === 'invoice' && obj.object === 'invoice') subscription = obj.parent.subscription_details.subscription;
  if (kind === 'price' && obj.object === 'price') lookupKey = obj.lookup_key;
  return { customer, subscription, lookup_key: lookupKey };
}

export class FakeStore {
  readonly db: Database.Database;

  constructor(readonly file: string) {
    if (file !== ':memory:') mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
    this.db = new Database(file);
    this.db.pragma('journal_mode = WAL');
    this.db.pragma('synchronous = NORMAL');
    this.db.pragma('busy_timeout = 5000');
    this.db.exec(SCHEMA);
  }

  close(): void {
    if (this.db.open) this.db.close();
  }

  tx<T>(fn: () => T): T {
    return this.db.transaction(fn)();
  }

  reset(): void {
    this.tx(() => {
      for (const table of ['objects', 'meter_events', 'idempotency', 'events', 'webhook_deliveries', 'meta']) {
        this.db.prepare(`DELETE FROM ${table}`).run();
      }
    });
  }

  insert<K extends ObjectKind>(kind: K, obj: ObjectTypes[K], internal: InternalTypes[K]): void {
    const idx = indexColumns(kind, obj);
    this.db
      .prepare(
        `INSERT INTO objects (id, kind, customer, subscription, lookup_key, created, data, internal)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(
        obj.id,
        kind,
        idx.customer,
        idx.subscription,
        idx.lookup_key,
        obj.created,
        JSON.stringify(obj),
        JSON.stringify(internal),
      );
  }

  save<K extends ObjectKind>(kind: K, obj: ObjectTypes[K], internal?: InternalTypes[K]): void {
    const idx = indexColumns(kind, obj);
    const result =
      internal === undefined
        ? this.db
            .prepare(
              `UPDATE objects SET customer = ?, subscription = ?, lookup_key = ?, data = ? WHERE id = ? AND kind = ?`,
            )
            .run(idx.customer, idx.subscription, idx.lookup_key, JSON.stringify(obj), obj.id, kind)
        : this.db
            .prepare(
              `UPDATE objects SET customer = ?, subscription = ?, lookup_key = ?, data = ?, internal = ? WHERE id = ? AND kind = ?`,
            )
            .run(
              idx.customer,
              idx.subscription,
              idx.lookup_key,
              JSON.stringify(obj),
              JSON.stringify(internal),
              obj.id,
              kind,
            );
    if (result.changes !== 1) throw new Error(`save: no ${kind} ${obj.id}`);
  }

  get<K extends ObjectKind>(kind: K, id: string): ObjectTypes[K] | undefined {
    const row = this.db.prepare(`SELECT seq, data, internal FROM objects WHERE id = ? AND kind = ?`).get(id, kind) as
      ObjectRow | undefined;
    return row ? (JSON.parse(row.data) as ObjectTypes[K]) : undefined;
  }

  internal<K extends ObjectKind>(kind: K, id: string): InternalTypes[K] | undefined {
    const row = this.db.prepare(`SELECT seq, data, internal FROM objects WHERE id = ? AND kind = ?`).get(id, kind) as
      ObjectRow | undefined;
    return row ? (JSON.parse(row.internal) as InternalTypes[K]) : undefined;
  }

  /** Newest first, with the API's cursor paging (`starting_after`, `ending_before`). */
  list<K extends ObjectKind>(
    kind: K,
    filter: ListFilter<ObjectTypes[K]>,
    page: Page,
  ): { data: ObjectTypes[K][]; hasMore: boolean } {
    const clauses = ['kind = ?'];
    const args: (string | number)[] = [kind];
    if (filter.customer !== undefined) {
      clauses.push('customer = ?');
      args.push(filter.customer);
    }
    if (filter.subscription !== undefined) {
      clauses.push('subscription = ?');
      args.push(filter.subscription);
    }
    if (filter.lookupKeys !== undefined) {
      if (filter.lookupKeys.length === 0) return { data: [], hasMore: false };
      clauses.push(`lookup_key IN (${filter.lookupKeys.map(() => '?').join(', ')})`);
      args.push(...filter.lookupKeys);
    }
    const rows = this.db
      .prepare(`SELECT seq, data, internal FROM objects WHERE ${clauses.join(' AND ')} ORDER BY seq DESC`)
      .all(...args) as ObjectRow[];
    let items = rows.map((row) => ({ seq: row.seq, obj: JSON.parse(row.data) as ObjectTypes[K] }));
    if (filter.where) {
      const where = filter.where;
      items = items.filter((item) => where(item.obj));
    }
    const seqOf = (id: string): number | undefined => {
      const row = this.db.prepare(`SELECT seq FROM objects WHERE id = ?`).get(id) as { seq: number } | undefined;
      return row?.seq;
    };
    if (page.startingAfter !== undefined) {
      const cursor = seqOf(page.startingAfter) ?? Number.POSITIVE_INFINITY;
      const after = items.filter((item) => item.seq < cursor);
      return { data: after.slice(0, page.limit).map((i) => i.obj), hasMore: after.length > page.limit };
    }
    if (page.endingBefore !== undefined) {
      const cursor = seqOf(page.endingBefore) ?? Number.NEGATIVE_INFINITY;
      const before = items.filter((item) => item.seq > cursor);
      const start = Math.max(0, before.length - page.limit);
      return { data: before.slice(start).map((i) => i.obj), hasMore: start > 0 };
    }
    return { data: items.slice(0, page.limit).map((i) => i.obj), hasMore: items.length > page.limit };
  }

  all<K extends ObjectKind>(kind: K): ObjectTypes[K][] {
    const rows = this.db
      .prepare(`SELECT seq, data, internal FROM objects WHERE kind = ? ORDER BY seq`)
      .all(kind) as ObjectRow[];
    return rows.map((row) => JSON.parse(row.data) as ObjectTypes[K]);
  }

  hasMeterEvent(identifier: string): boolean {
    return this.db.prepare(`SELECT 1 FROM meter_events WHERE identifier = ?`).get(identifier) !== undefined;
  }

  insertMeterEvent(stored: Omit<StoredMeterEvent, 'invoice'>): void {
    const { event } = stored;
    this.db
      .prepare(
        `INSERT INTO meter_events (identifier, event_name, meter, customer, value, timestamp, created, payload)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(
        event.identifier,
        event.event_name,
        stored.meter,
        stored.customer,
        stored.value,
        event.timestamp,
        event.created,
        JSON.stringify(event.payload),
      );
  }

  private toStoredMeterEvent(row: MeterEventRow): StoredMeterEvent {
    return {
      meter: row.meter,
      customer: row.customer,
      value: row.value,
      invoice: row.invoice,
      event: {
        object: 'billing.meter_event',
        created: row.created,
        event_name: row.event_name,
        identifier: row.identifier,
        livemode: false,
        payload: JSON.parse(row.payload) as Record<string, string>,
        timestamp: row.timestamp,
      },
    };
  }

  /** Events of one meter and customer with `startTime <= timestamp < endTime`, oldest first. */
  meterEventsInWindow(meter: string, customer: string, startTime: number, endTime: number): StoredMeterEvent[] {
    const rows = this.db
      .prepare(
        `SELECT * FROM meter_events WHERE meter = ? AND customer = ? AND timestamp >= ? AND timestamp < ?
         ORDER BY timestamp, seq`,
      )
      .all(meter, customer, startTime, endTime) as MeterEventRow[];
    return rows.map((row) => this.toStoredMeterEvent(row));
  }

  /** Events not yet on any invoice with `timestamp <= upTo`, oldest first. */
  unbilledMeterEvents(meter: string, customer: string, upTo: number): StoredMeterEvent[] {
    const rows = this.db
      .prepare(
        `SELECT * FROM meter_events WHERE meter = ? AND customer = ? AND invoice IS NULL AND timestamp <= ?
         ORDER BY timestamp, seq`,
      )
      .all(meter, customer, upTo) as MeterEventRow[];
    return rows.map((row) => this.toStoredMeterEvent(row));
  }

  hasMeterEventAt(customer: string, timestamp: number): boolean {
    return (
      this.db
        .prepare(`SELECT 1 FROM meter_events WHERE customer = ? AND timestamp = ? LIMIT 1`)
        .get(customer, timestamp) !== undefined
    );
  }

  markMeterEventsBilled(identifiers: string[], invoice: string): void {
    const stmt = this.db.prepare(`UPDATE meter_events SET invoice = ? WHERE identifier = ?`);
    for (const id of identifiers) stmt.run(invoice, id);
  }

  allMeterEvents(): StoredMeterEvent[] {
    const rows = this.db.prepare(`SELECT * FROM meter_events ORDER BY seq`).all() as MeterEventRow[];
    return rows.map((row) => this.toStoredMeterEvent(row));
  }

  getIdempotency(key: string): IdempotencyRecord | undefined {
    const row = this.db.prepare(`SELECT * FROM idempotency WHERE key = ?`).get(key) as
      | {
          key: string;
          method: string;
          path: string;
          body_hash: string;
          status: number;
          response: string;
          created: number;
        }
      | undefined;
    if (!row) return undefined;
    return {
      key: row.key,
      method: row.method,
      path: row.path,
      bodyHash: row.body_hash,
      status: row.status,
      response: row.response,
      created: row.created,
    };
  }

  putIdempotency(record: IdempotencyRecord): void {
    this.db
      .prepare(
        `INSERT OR REPLACE INTO idempotency (key, method, path, body_hash, status, response, created)
         VALUES (?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(record.key, record.method, record.path, record.bodyHash, record.status, record.response, record.created);
  }

  countIdempotency(): number {
    return (this.db.prepare(`SELECT COUNT(*) AS n FROM idempotency`).get() as { n: number }).n;
  }

  insertEvent(event: FakeEvent, deliveryStatus: DeliveryStatus): void {
    this.db
      .prepare(`INSERT INTO events (id, type, created, data, delivery_status) VALUES (?, ?, ?, ?, ?)`)
      .run(event.id, event.type, event.created, JSON.stringify(event), deliveryStatus);
  }

  getEvent(id: string): StoredEvent | undefined {
    const row = this.db.prepare(`SELECT data, delivery_status FROM events WHERE id = ?`).get(id) as
      { data: string; delivery_status: DeliveryStatus } | undefined;
    return row ? { event: JSON.parse(row.data) as FakeEvent, deliveryStatus: row.delivery_status } : undefined;
  }

  /** Newest first. */
  listEvents(filter: { types?: string[] }, page: Page): { data: FakeEvent[]; hasMore: boolean } {
    const rows = this.db.prepare(`SELECT seq, id, type, data FROM events ORDER BY seq DESC`).all() as {
      seq: number;
      id: string;
      type: string;
      data: string;
    }[];
    let items = rows;
    if (filter.types) {
      const types = filter.types;
      items = items.filter((r) => types.includes(r.type));
    }
    const seqOf = (id: string): number | undefined => rows.find((r) => r.id === id)?.seq;
    let window = items;
    let hasMore: boolean;
    if (page.startingAfter !== undefined) {
      const cursor = seqOf(page.startingAfter) ?? Number.POSITIVE_INFINITY;
      window = items.filter((r) => r.seq < cursor);
      hasMore = window.length > page.limit;
      window = window.slice(0, page.limit);
    } else if (page.endingBefore !== undefined) {
      const cursor = seqOf(page.endingBefore) ?? Number.NEGATIVE_INFINITY;
      const before = items.filter((r) => r.seq > cursor);
      const start = Math.max(0, before.length - page.limit);
      hasMore = start > 0;
      window = before.slice(start);
    } else {
      hasMore = items.length > page.limit;
      window = items.slice(0, page.limit);
    }
    return { data: window.map((r) => JSON.parse(r.data) as FakeEvent), hasMore };
  }

  allEvents(): StoredEvent[] {
    const rows = this.db.prepare(`SELECT data, delivery_status FROM events ORDER BY seq`).all() as {
      data: string;
      delivery_status: DeliveryStatus;
    }[];
    return rows.map((r) => ({ event: JSON.parse(r.data) as FakeEvent, deliveryStatus: r.delivery_status }));
  }

  eventIdsWithStatus(status: DeliveryStatus): string[] {
    const rows = this.db.prepare(`SELECT id FROM events WHERE delivery_status = ? ORDER BY seq`).all(status) as {
      id: string;
    }[];
    return rows.map((r) => r.id);
  }

  setDeliveryStatus(eventId: string, status: DeliveryStatus): void {
    this.db.prepare(`UPDATE events SET delivery_status = ? WHERE id = ?`).run(status, eventId);
  }

  addDelivery(record: Omit<DeliveryRecord, 'id'>): void {
    this.db
      .prepare(
        `INSERT INTO webhook_deliveries (event_id, attempt, at_ms, url, status, error, duration_ms)
         VALUES (?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(record.eventId, record.attempt, record.atMs, record.url, record.status, record.error, record.durationMs);
  }

  deliveries(eventId?: string): DeliveryRecord[] {
    const rows = (
      eventId === undefined
        ? this.db.prepare(`SELECT * FROM webhook_deliveries ORDER BY id`).all()
        : this.db.prepare(`SELECT * FROM webhook_deliveries WHERE event_id = ? ORDER BY id`).all(eventId)
    ) as {
      id: number;
      event_id: string;
      attempt: number;
      at_ms: number;
      url: string;
      status: number | null;
      error: string | null;
      duration_ms: number;
    }[];
    return rows.map((r) => ({
      id: r.id,
      eventId: r.event_id,
      attempt: r.attempt,
      atMs: r.at_ms,
      url: r.url,
      status: r.status,
      error: r.error,
      durationMs: r.duration_ms,
    }));
  }

  getMeta(key: string): string | undefined {
    const row = this.db.prepare(`SELECT value FROM meta WHERE key = ?`).get(key) as { value: string } | undefined;
    return row?.value;
  }

  setMeta(key: string, value: string): void {
    this.db.prepare(`INSERT OR REPLACE INTO meta (key, value) VALUES (?, ?)`).run(key, value);
  }
}

/** The meter's aggregation over a set of events: `sum` of values, `count` of events, or the `last` value. */
export function aggregate(formula: AggregationFormula, events: StoredMeterEvent[]): number {
  if (formula === 'count') return events.length;
  if (formula === 'last') return events.length === 0 ? 0 : events[events.length - 1].value;
  return events.reduce((sum, e) => sum + e.value, 0);
}
