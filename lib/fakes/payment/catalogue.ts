import {
  CURRENCY,
  METERED_PRODUCT,
  METER_CUSTOMER_PAYLOAD_KEY,
  METER_DISPLAY_NAME,
  METER_EVENT_NAME,
  METER_VALUE_PAYLOAD_KEY,
  PLANS,
  PLAN_IDS,
} from '../../billing/plan-catalogue';
import { PAGE_PARAMS, listBody, readPage, type ApiContext } from './common';
import { invalidRequest, resourceMissing } from './errors';
import { applyMetadata, type Params } from './form';
import { newId } from './ids';
import type { FakeStore } from './store';
import type { AggregationFormula, FakeMeter, FakePrice, FakeProduct } from './types';

// Products

function blankProduct(id: string, name: string, now: number): FakeProduct {
  return {
    id,
    object: 'product',
    active: true,
    created: now,
    default_price: null,
    description: null,
    images: [],
    livemode: false,
    marketing_features: [],
    metadata: {},
    name,
    package_dimensions: null,
    shippable: null,
    statement_descriptor: null,
    tax_code: null,
    tax_details: null,
    type: 'service',
    unit_label: null,
    updated: now,
    url: null,
  };
}

export function createProduct(ctx: ApiContext, params: Params): FakeProduct {
  params.allowOnly([
    'id',
    'name',
    'description',
    'metadata',
    'unit_label',
    'active',
    'expand',
    'statement_descriptor',
    'tax_code',
    'images',
    'url',
  ]);
  const id = params.str('id') || newId('prod');
  if (ctx.store.get('product', id)) {
    throw invalidRequest(`Product already exists.`, 'id', 'resource_already_exists');
  }
  const product = blankProduct(id, params.requireStr('name'), ctx.now);
  product.description = params.nullableStr('description') ?? null;
  product.unit_label = params.nullableStr('unit_label') ?? null;
  product.active = params.bool('active') ?? true;
  product.metadata = applyMetadata({}, params.metadata());
  ctx.store.insert('product', product, {});
  return product;
}

function requireProduct(ctx: ApiContext, id: string, param?: string): FakeProduct {
  const product = ctx.store.get('product', id);
  if (!product) throw resourceMissing('product', id, param);
  return product;
}

export function retrieveProduct(ctx: ApiContext, params: Params, id: string): FakeProduct {
  params.allowOnly(['expand']);
  return requireProduct(ctx, id);
}

export function updateProduct(ctx: ApiContext, params: Params, id: string): FakeProduct {
  params.allowOnly(['name', 'description', 'metadata', 'unit_label', 'active', 'default_price', 'expand']);
  const product = requireProduct(ctx, id);
  const name = params.str('name');
  if (name) product.name = name;
  const description = params.nullableStr('description');
  if (description !== undefined) product.description = description;
  const unitLabel = params.nullableStr('unit_label');
  if (unitLabel !== undefined) product.unit_label = unitLabel;
  const active = params.bool('active');
  if (active !== undefined) product.active = active;
  const defaultPrice = params.nullableStr('default_price');
  if (defaultPrice !== undefined) product.default_price = defaultPrice;
  product.metadata = applyMetadata(product.metadata, params.metadata());
  product.updated = ctx.now;
  ctx.store.save('product', product);
  return product;
}

export function listProducts(ctx: ApiContext, params: Params) {
  params.allowOnly([...PAGE_PARAMS, 'active', 'ids', 'created', 'shippable', 'url']);
  const active = params.bool('active');
  const ids = params.strList('ids');
  const { data, hasMore } = ctx.store.list(
    'product',
    { where: (p) => (active === undefined || p.active === active) && (ids === undefined || ids.includes(p.id)) },
    readPage(params),
  );
  return listBody('/v1/products', data, hasMore);
}

// Prices

const INTERVALS = ['day', 'week', 'month', 'year'] as const;

export function requirePrice(ctx: ApiContext, id: string, param?: string): FakePrice {
  const price = ctx.store.get('price', id);
  if (!price) throw resourceMissing('price', id, param);
  return price;
}

function priceWithLookupKey(store: FakeStore, lookupKey: string): FakePrice | undefined {
  return store.list('price', { lookupKeys: [lookupKey] }, { limit: 1 }).data[0];
}

function claimLookupKey(ctx: ApiContext, lookupKey: string, transfer: boolean): void {
  const holder = priceWithLookupKey(ctx.store, lookupKey);
  if (!holder) return;
  if (!transfer) {
    throw invalidRequest(
      `A price (\`${holder.id}\`) already uses that lookup key.`,
      'lookup_key',
      'lookup_key_already_exists',
    );
  }
  holder.lookup_key = null;
  ctx.store.save('price', holder);
}

export function createPrice(ctx: ApiContext, params: Params): FakePrice {
  params.allowOnly([
    'currency',
    'unit_amount',
    'unit_amount_decimal',
    'product',
    'product_data',
    'recurring',
    'lookup_key',
    'transfer_lookup_key',
    'nickname',
    'metadata',
    'active',
    'billing_scheme',
    'tax_behavior',
    'expand',
  ]);
  const currency = params.requireStr('currency').toLowerCase();
  const scheme = params.oneOf('billing_scheme', ['per_unit', 'tiered'] as const);
  if (scheme === 'tiered')
    throw invalidRequest('The payment fake only supports billing_scheme=per_unit.', 'billing_scheme');
  const decimal = params.str('unit_amount_decimal');
  let unitAmount = params.int('unit_amount', { min: 0 });
  if (unitAmount === undefined && decimal !== undefined) {
    if (!/^\d+$/.test(decimal))
      throw invalidRequest('The payment fake only supports whole-cent unit amounts.', 'unit_amount_decimal');
    unitAmount = Number(decimal);
  }
  if (unitAmount === undefined)
    throw invalidRequest('Missing required param: unit_amount.', 'unit_amount', 'parameter_missing');

  let productId = params.str('product');
  const productData = params.obj('product_data');
  if (!productId && productData) {
    productData.allowOnly(['name', 'metadata', 'unit_label', 'active', 'id', 'statement_descriptor']);
    const product = blankProduct(productData.str('id') || newId('prod'), productData.requireStr('name'), ctx.now);
    product.unit_label = productData.nullableStr('unit_label') ?? null;
    product.metadata = applyMetadata({}, productData.metadata());
    ctx.store.insert('product', product, {});
    productId = product.id;
  }
  if (!productId) throw invalidRequest('Missing required param: product.', 'product', 'parameter_missing');
  requireProduct(ctx, productId, 'product');

  let recurring: FakePrice['recurring'] = null;
  const rec = params.obj('recurring');
  if (rec) {
    rec.allowOnly(['interval', 'interval_count', 'usage_type', 'meter', 'trial_period_days', 'aggregate_usage']);
    const interval = rec.oneOf('interval', INTERVALS);
    if (!interval)
      throw invalidRequest('Missing required param: recurring[interval].', 'recurring[interval]', 'parameter_missing');
    const usageType = rec.oneOf('usage_type', ['licensed', 'metered'] as const) ?? 'licensed';
    const meterId = rec.str('meter') || null;
    if (usageType === 'metered' && !meterId) {
      throw invalidRequest(
        'A metered price must be tied to a meter: pass recurring[meter].',
        'recurring[meter]',
        'parameter_missing',
      );
    }
    if (meterId) {
      const meter = ctx.store.get('meter', meterId);
      if (!meter) throw resourceMissing('billing meter', meterId, 'recurring[meter]');
      if (meter.status !== 'active') throw invalidRequest(`Meter ${meterId} is not active.`, 'recurring[meter]');
      if (usageType !== 'metered')
        throw invalidRequest('recurring[meter] needs recurring[usage_type]=metered.', 'recurring[usage_type]');
    }
    recurring = {
      interval,
      interval_count: rec.int('interval_count', { min: 1, max: 36 }) ?? 1,
      meter: meterId,
      trial_period_days: null,
      usage_type: usageType,
    };
  }

  const lookupKey = params.nullableStr('lookup_key') ?? null;
  if (lookupKey) claimLookupKey(ctx, lookupKey, params.bool('transfer_lookup_key') ?? false);

  const price: FakePrice = {
    id: newId('price'),
    object: 'price',
    active: params.bool('active') ?? true,
    billing_scheme: 'per_unit',
    created: ctx.now,
    currency,
    custom_unit_amount: null,
    livemode: false,
    lookup_key: lookupKey,
    metadata: applyMetadata({}, params.metadata()),
    nickname: params.nullableStr('nickname') ?? null,
    product: productId,
    recurring,
    tax_behavior: 'unspecified',
    tiers_mode: null,
    transform_quantity: null,
    type: recurring ? 'recurring' : 'one_time',
    unit_amount: unitAmount,
    unit_amount_decimal: String(unitAmount),
  };
  ctx.store.insert('price', price, {});
  return price;
}

export function retrievePrice(ctx: ApiContext, params: Params, id: string): FakePrice {
  params.allowOnly(['expand']);
  return requirePrice(ctx, id);
}

export function updatePrice(ctx: ApiContext, params: Params, id: string): FakePrice {
  params.allowOnly(['active', 'lookup_key', 'transfer_lookup_key', 'nickname', 'metadata', 'expand', 'tax_behavior']);
  const price = requirePrice(ctx, id);
  const active = params.bool('active');
  if (active !== undefined) price.active = active;
  const nickname = params.nullableStr('nickname');
  if (nickname !== undefined) price.nickname = nickname;
  const lookupKey = params.nullableStr('lookup_key');
  if (lookupKey !== undefined && lookupKey !== price.lookup_key) {
    if (lookupKey) claimLookupKey(ctx, lookupKey, params.bool('transfer_lookup_key') ?? false);
    price.lookup_key = lookupKey;
  }
  price.metadata = applyMetadata(price.metadata, params.metadata());
  ctx.store.save('price', price);
  return price;
}

export function listPrices(ctx: ApiContext, params: Params) {
  params.allowOnly([...PAGE_PARAMS, 'active', 'currency', 'lookup_keys', 'product', 'type', 'recurring', 'created']);
  const active = params.bool('active');
  const currency = params.str('currency');
  const product = params.str('product');
  const type = params.oneOf('type', ['one_time', 'recurring'] as const);
  const lookupKeys = params.strList('lookup_keys');
  const recurring = params.obj('recurring');
  const usageType = recurring?.oneOf('usage_type', ['licensed', 'metered'] as const);
  const { data, hasMore } = ctx.store.list(
    'price',
    {
      lookupKeys,
      where: (p) =>
        (active === undefined || p.active === active) &&
        (currency === undefined || p.currency === currency) &&
        (product === undefined || p.product === product) &&
        (type === undefined || p.type === type) &&
        (usageType === undefined || p.recurring?.usage_type === usageType),
    },
    readPage(params),
  );
  return listBody('/v1/prices', data, hasMore);
}

// Billing meters

export function requireMeter(ctx: ApiContext, id: string, param?: string): FakeMeter {
  const meter = ctx.store.get('meter', id);
  if (!meter) throw resourceMissing('billing meter', id, param);
  return meter;
}

export function activeMeterForEvent(store: FakeStore, eventName: string): FakeMeter | undefined {
  return store.list('meter', { where: (m) => m.status === 'active' && m.event_name === eventName }, { limit: 1 })
    .data[0];
}

export function createMeter(ctx: ApiContext, params: Params): FakeMeter {
  params.allowOnly([
    'display_name',
    'event_name',
    'default_aggregation',
    'customer_mapping',
    'value_settings',
    'event_time_window',
    'expand',
  ]);
  const displayName = params.requireStr('display_name');
  const eventName = params.requireStr('event_name');
  const aggregation = params.obj('default_aggregation');
  if (!aggregation) {
    throw invalidRequest('Missing required param: default_aggregation.', 'default_aggregation', 'parameter_missing');
  }
  const formula = aggregation.oneOf('formula', ['sum', 'count', 'last'] as const);
  if (!formula) {
    throw invalidRequest(
      'Missing required param: default_aggregation[formula].',
      'default_aggregation[formula]',
      'parameter_missing',
    );
  }
  if (activeMeterForEvent(ctx.store, eventName)) {
    throw invalidRequest(
      `An active meter with event_name \`${eventName}\` already exists.`,
      'event_name',
      'resource_already_exists',
    );
  }
  const mapping = params.obj('customer_mapping');
  const valueSettings = params.obj('value_settings');
  const meter = buildMeter(
    ctx.now,
    displayName,
    eventName,
    formula,
    mapping?.str('event_payload_key') || METER_CUSTOMER_PAYLOAD_KEY,
    valueSettings?.str('event_payload_key') || METER_VALUE_PAYLOAD_KEY,
  );
  ctx.store.insert('meter', meter, {});
  return meter;
}

function buildMeter(
  now: number,
  displayName: string,
  eventName: string,
  formula: AggregationFormula,
  customerKey: string,
  valueKey: string,
): FakeMeter {
  return {
    id: newId('mtr'),
    object: 'billing.meter',
    created: now,
    customer_mapping: { event_payload_key: customerKey, type: 'by_id' },
    default_aggregation: { formula },
    display_name: displayName,
    event_name: eventName,
    event_time_window: null,
    livemode: false,
    status: 'active',
    status_transitions: { deactivated_at: null },
    updated: now,
    value_settings: { event_payload_key: valueKey },
  };
}

export function retrieveMeter(ctx: ApiContext, params: Params, id: string): FakeMeter {
  params.allowOnly(['expand']);
  return requireMeter(ctx, id);
}

export function updateMeter(ctx: ApiContext, params: Params, id: string): FakeMeter {
  params.allowOnly(['display_name', 'expand']);
  const meter = requireMeter(ctx, id);
  const name = params.str('display_name');
  if (name) meter.display_name = name;
  meter.updated = ctx.now;
  ctx.store.save('meter', meter);
  return meter;
}

export function setMeterStatus(ctx: ApiContext, params: Params, id: string, status: 'active' | 'inactive'): FakeMeter {
  params.allowOnly(['expand']);
  const meter = requireMeter(ctx, id);
  if (status === 'active' && meter.status !== 'active' && activeMeterForEvent(ctx.store, meter.event_name)) {
    throw invalidRequest(`An active meter with event_name \`${meter.event_name}\` already exists.`);
  }
  meter.status = status;
  meter.status_transitions.deactivated_at = status === 'inactive' ? ctx.now : null;
  meter.updated = ctx.now;
  ctx.store.save('meter', meter);
  return meter;
}

export function listMeters(ctx: ApiContext, params: Params) {
  params.allowOnly([...PAGE_PARAMS, 'status']);
  const status = params.oneOf('status', ['active', 'inactive'] as const);
  const { data, hasMore } = ctx.store.list(
    'meter',
    { where: (m) => status === undefined || m.status === status },
    readPage(params),
  );
  return listBody('/v1/billing/meters', data, hasMore);
}

// The plan catalogue, created at start-up when missing

/**
 * Creates the meter, products and prices of `lib/billing/plans.ts` that are missing, matched by
 * event name, product id and lookup key. A price whose amount no longer matches the catalogue is
 * replaced by a new price that takes over the lookup key. Returns the ids created.
 */
export function ensureCatalogue(store: FakeStore, now: number): string[] {
  const created: string[] = [];
  return store.tx(() => {
    let meter = activeMeterForEvent(store, METER_EVENT_NAME);
    if (!meter) {
      meter = buildMeter(
        now,
        METER_DISPLAY_NAME,
        METER_EVENT_NAME,
        'sum',
        METER_CUSTOMER_PAYLOAD_KEY,
        METER_VALUE_PAYLOAD_KEY,
      );
      store.insert('meter', meter, {});
      created.push(meter.id);
    }
    const ensureProduct = (id: string, name: string, description: string | null, unitLabel: string | null) => {
      if (store.get('product', id)) return;
      const product = blankProduct(id, name, now);
      product.description = description;
      product.unit_label = unitLabel;
      store.insert('product', product, {});
      created.push(id);
    };
    ensureProduct(METERED_PRODUCT.id, METERED_PRODUCT.name, null, METERED_PRODUCT.unitLabel);
    const ensurePrice = (
      lookupKey: string,
      product: string,
      unitAmount: number,
      meterId: string | null,
      nickname: string,
      metadata: Record<string, string>,
    ) => {
      const existing = priceWithLookupKey(store, lookupKey);
      const usageType = meterId ? 'metered' : 'licensed';
      if (
        existing &&
        existing.unit_amount === unitAmount &&
        existing.product === product &&
        existing.recurring?.usage_type === usageType &&
        existing.recurring.meter === meterId
      ) {
        return;
      }
      if (existing) {
        existing.lookup_key = null;
        store.save('price', existing);
      }
      const price: FakePrice = {
        id: newId('price'),
        object: 'price',
        active: true,
        billing_scheme: 'per_unit',
        created: now,
        currency: CURRENCY,
        custom_unit_amount: null,
        livemode: false,
        lookup_key: lookupKey,
        metadata,
        nickname,
        product,
        recurring: {
          interval: 'month',
          interval_count: 1,
          meter: meterId,
          trial_period_days: null,
          usage_type: usageType,
        },
        tax_behavior: 'unspecified',
        tiers_mode: null,
        transform_quantity: null,
        type: 'recurring',
        unit_amount: unitAmount,
        unit_amount_decimal: String(unitAmount),
      };
      store.insert('price', price, {});
      created.push(price.id);
    };
    for (const id of PLAN_IDS) {
      const plan = PLANS[id];
      ensureProduct(plan.productId, `Tropopass ${plan.name}`, plan.description, null);
      ensurePrice(plan.baseLookupKey, plan.productId, plan.baseFeeCents, null, `${plan.name} monthly fee`, {
        plan: plan.id,
        kind: 'base',
      });
      ensurePrice(
        plan.meteredLookupKey,
        METERED_PRODUCT.id,
        plan.perFlightCents,
        meter.id,
        `${plan.name} per screened flight`,
        {
          plan: plan.id,
          kind: 'metered',
        },
      );
    }
    return created;
  });
}
