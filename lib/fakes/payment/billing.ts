import { requirePrice } from './catalogue';
import {
  PAGE_PARAMS,
  Reply,
  addInterval,
  clone,
  formatMoney,
  listBody,
  previousAttributes,
  readPage,
  type ApiContext,
} from './common';
import { requireCustomer } from './customers';
import { FakeApiError, cardDeclined, invalidRequest, resourceMissing } from './errors';
import { applyMetadata, type Params } from './form';
import { newId } from './ids';
import { cardBehavior, resolvePaymentMethod } from './payment-methods';
import { aggregate } from './store';
import type {
  FakeCustomer,
  FakeInvoice,
  FakeInvoiceLine,
  FakePrice,
  FakeSubscription,
  FakeSubscriptionItem,
  SubscriptionStatus,
} from './types';

/**
 * Subscriptions and invoices. The fake bills in arrears: closing a period (`POST /_fake/advance`, or
 * `trial_end=now`, or cancelling with `invoice_now`) makes one invoice of the period's flat fees plus
 * every not-yet-billed meter event up to that moment times the metered unit price, then charges the
 * default payment method. A trial period is free: its invoice is $0. Plan changes take effect for the
 * whole open period, with no proration.
 */

const MAX_TRIAL_DAYS = 730;
const RETRY_AFTER_SECONDS = 3 * 86_400;

export function requireSubscription(ctx: ApiContext, id: string, param?: string): FakeSubscription {
  const sub = ctx.store.get('subscription', id);
  if (!sub) throw resourceMissing('subscription', id, param);
  return sub;
}

export function requireInvoice(ctx: ApiContext, id: string, param?: string): FakeInvoice {
  const invoice = ctx.store.get('invoice', id);
  if (!invoice) throw resourceMissing('invoice', id, param);
  return invoice;
}

function periodOf(sub: FakeSubscription): { start: number; end: number } {
  const first = sub.items.data[0];
  return { start: first.current_period_start, end: first.current_period_end };
}

function cadenceOf(sub: FakeSubscription): { interval: 'day' | 'week' | 'month' | 'year'; count: number } {
  const recurring = sub.items.data[0].price.recurring;
  return recurring
    ? { interval: recurring.interval, count: recurring.interval_count }
    : { interval: 'month', count: 1 };
}

function setPeriod(sub: FakeSubscription, start: number, end: number): void {
  for (const item of sub.items.data) {
    item.current_period_start = start;
    item.current_period_end = end;
  }
}

interface ItemRequest {
  price: FakePrice;
  quantity: number | undefined;
  metadata: Record<string, string>;
}

function recurringPrice(ctx: ApiContext, id: string, param: string): FakePrice {
  const price = requirePrice(ctx, id, param);
  if (!price.active)
    throw invalidRequest(`The price specified is inactive. This field only accepts active prices.`, param);
  if (!price.recurring) {
    throw invalidRequest(
      `The price specified is set to \`type=one_time\` but this field only accepts prices with \`type=recurring\`.`,
      param,
    );
  }
  return price;
}

function itemQuantity(item: Params, price: FakePrice, param: string): number | undefined {
  const quantity = item.int('quantity', { min: 0 });
  if (price.recurring?.usage_type === 'metered') {
    if (quantity !== undefined) {
      throw invalidRequest(
        'Quantity should not be specified where usage_type is `metered`. Remove quantity from the request.',
        param,
      );
    }
    return undefined;
  }
  return quantity ?? 1;
}

function buildItem(
  subscriptionId: string,
  request: ItemRequest,
  now: number,
  period: { start: number; end: number },
): FakeSubscriptionItem {
  const item: FakeSubscriptionItem = {
    id: newId('si'),
    object: 'subscription_item',
    billing_thresholds: null,
    created: now,
    current_period_end: period.end,
    current_period_start: period.start,
    discounts: [],
    metadata: request.metadata,
    price: clone(request.price),
    subscription: subscriptionId,
    tax_rates: [],
  };
  if (request.quantity !== undefined) item.quantity = request.quantity;
  return item;
}

function checkItems(items: FakeSubscriptionItem[]): void {
  if (items.length === 0) throw invalidRequest('A subscription must have at least one item.', 'items');
  const seen = new Set<string>();
  for (const item of items) {
    if (seen.has(item.price.id)) {
      throw invalidRequest(`Cannot add multiple subscription items with the same price: ${item.price.id}.`, 'items');
    }
    seen.add(item.price.id);
  }
  const currencies = new Set(items.map((i) => i.price.currency));
  if (currencies.size > 1) throw invalidRequest('All prices on a subscription must have the same currency.', 'items');
  const cadences = new Set(items.map((i) => `${i.price.recurring?.interval}/${i.price.recurring?.interval_count}`));
  if (cadences.size > 1)
    throw invalidRequest('All prices on a subscription must have the same recurring interval.', 'items');
}

function itemsList(subscriptionId: string, data: FakeSubscriptionItem[]) {
  return listBody(`/v1/subscription_items?subscription=${subscriptionId}`, data, false);
}

const SUBSCRIPTION_IGNORED = [
  'expand',
  'payment_behavior',
  'proration_behavior',
  'off_session',
  'collection_method',
  'payment_settings',
  'trial_settings',
] as const;

export function createSubscription(ctx: ApiContext, params: Params): FakeSubscription {
  params.allowOnly([
    ...SUBSCRIPTION_IGNORED,
    'customer',
    'items',
    'trial_period_days',
    'trial_end',
    'default_payment_method',
    'metadata',
    'description',
    'cancel_at_period_end',
    'currency',
    'backdate_start_date',
  ]);
  const collection = params.str('collection_method');
  if (collection && collection !== 'charge_automatically') {
    throw invalidRequest('The payment fake only supports collection_method=charge_automatically.', 'collection_method');
  }
  const customerId = params.requireStr('customer');
  requireCustomer(ctx, customerId, 'customer');
  const itemParams = params.objList('items');
  if (!itemParams || itemParams.length === 0)
    throw invalidRequest('Missing required param: items.', 'items', 'parameter_missing');

  const requests: ItemRequest[] = itemParams.map((item, i) => {
    item.allowOnly(['price', 'quantity', 'metadata', 'tax_rates', 'discounts']);
    const price = recurringPrice(ctx, item.requireStr('price'), `items[${i}][price]`);
    return {
      price,
      quantity: itemQuantity(item, price, `items[${i}][quantity]`),
      metadata: applyMetadata({}, item.metadata()),
    };
  });

  const trialDays = params.int('trial_period_days', { min: 0, max: MAX_TRIAL_DAYS });
  const trialEndRaw = params.str('trial_end');
  let trialEnd: number | null = null;
  if (trialDays !== undefined && trialEndRaw !== undefined) {
    throw invalidRequest('You may only specify one of these parameters: trial_end, trial_period_days.', 'trial_end');
  }
  if (trialDays) trialEnd = ctx.now + trialDays * 86_400;
  if (trialEndRaw !== undefined && trialEndRaw !== 'now') {
    const t = params.requireInt('trial_end');
    if (t <= ctx.now)
      throw invalidRequest('Invalid timestamp: must be an integer Unix timestamp in the future.', 'trial_end');
    trialEnd = t;
  }

  // A backdated start bills the span from it to now at once, as one period closed at creation (no proration).
  const backdate = params.int('backdate_start_date', { min: 0, max: ctx.now - 1 });
  if (backdate !== undefined && trialEnd !== null)
    throw invalidRequest('backdate_start_date cannot be combined with a trial.', 'backdate_start_date');
  const id = newId('sub');
  const first = requests[0].price.recurring;
  const periodEnd =
    trialEnd ??
    (backdate !== undefined ? ctx.now : addInterval(ctx.now, first?.interval ?? 'month', first?.interval_count ?? 1));
  const period = { start: backdate ?? ctx.now, end: periodEnd };
  const items = requests.map((r) => buildItem(id, r, ctx.now, period));
  checkItems(items);

  const pmParam = params.nullableStr('default_payment_method');
  const defaultPm = pmParam ? resolvePaymentMethod(ctx, customerId, pmParam, 'default_payment_method') : null;
  const cancelAtPeriodEnd = params.bool('cancel_at_period_end') ?? false;

  const sub: FakeSubscription = {
    id,
    object: 'subscription',
    application: null,
    application_fee_percent: null,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null },
    billing_cycle_anchor: trialEnd ?? ctx.now,
    billing_cycle_anchor_config: null,
    billing_thresholds: null,
    cancel_at: cancelAtPeriodEnd ? period.end : null,
    cancel_at_period_end: cancelAtPeriodEnd,
    canceled_at: cancelAtPeriodEnd ? ctx.now : null,
    cancellation_details: {
      comment: null,
      feedback: null,
      feedback_option: null,
      reason: cancelAtPeriodEnd ? 'cancellation_requested' : null,
    },
    collection_method: 'charge_automatically',
    created: ctx.now,
    currency: items[0].price.currency,
    customer: customerId,
    customer_account: null,
    days_until_due: null,
    default_payment_method: defaultPm,
    default_source: null,
    description: params.nullableStr('description') ?? null,
    discounts: [],
    ended_at: null,
    invoice_settings: {
      account_tax_ids: null,
      custom_fields: null,
      description: null,
      footer: null,
      issuer: { type: 'self' },
    },
    items: itemsList(id, items),
    latest_invoice: null,
    livemode: false,
    metadata: applyMetadata({}, params.metadata()),
    next_pending_invoice_item_invoice: null,
    on_behalf_of: null,
    pause_collection: null,
    payment_settings: null,
    pending_invoice_item_interval: null,
    pending_setup_intent: null,
    pending_update: null,
    schedule: null,
    start_date: backdate ?? ctx.now,
    status: trialEnd ? 'trialing' : 'active',
    test_clock: null,
    transfer_data: null,
    trial_end: trialEnd,
    trial_settings: { end_behavior: { billing_cycle_anchor: null, missing_payment_method: 'create_invoice' } },
    trial_start: trialEnd ? ctx.now : null,
  };
  ctx.store.insert('subscription', sub, {});
  ctx.emit('customer.subscription.created', sub);
  if (backdate !== undefined) {
    const before = clone(sub);
    closePeriodInPlace(ctx, sub, false, backdate);
    // The created event carries the backdated period; this one the current period it rolled into.
    ctx.emit('customer.subscription.updated', sub, previousAttributes(before, sub));
    return requireSubscription(ctx, id);
  }
  return sub;
}

export function retrieveSubscription(ctx: ApiContext, params: Params, id: string): FakeSubscription {
  params.allowOnly(['expand']);
  return requireSubscription(ctx, id);
}

const LIST_STATUSES = [
  'active',
  'past_due',
  'trialing',
  'canceled',
  'all',
  'ended',
  'incomplete',
  'incomplete_expired',
  'unpaid',
  'paused',
] as const;

export function listSubscriptions(ctx: ApiContext, params: Params) {
  params.allowOnly([
    ...PAGE_PARAMS,
    'customer',
    'price',
    'status',
    'created',
    'current_period_end',
    'current_period_start',
    'collection_method',
    'test_clock',
  ]);
  const customer = params.str('customer');
  const price = params.str('price');
  const status = params.oneOf('status', LIST_STATUSES);
  const matchesStatus = (s: SubscriptionStatus): boolean => {
    if (status === undefined) return s !== 'canceled';
    if (status === 'all') return true;
    if (status === 'ended') return s === 'canceled';
    return s === status;
  };
  const { data, hasMore } = ctx.store.list(
    'subscription',
    {
      customer,
      where: (s) => matchesStatus(s.status) && (price === undefined || s.items.data.some((i) => i.price.id === price)),
    },
    readPage(params),
  );
  return listBody('/v1/subscriptions', data, hasMore);
}

// Invoices

interface BuiltInvoice {
  invoice: FakeInvoice;
  billedEventIds: string[];
}

function buildInvoice(
  ctx: ApiContext,
  sub: FakeSubscription,
  customer: FakeCustomer,
  period: { start: number; end: number },
  options: { trial: boolean; preview: boolean; usageUpTo: number },
): BuiltInvoice {
  const id = options.preview ? newId('upcoming_in') : newId('in');
  const billedEventIds: string[] = [];
  const lines: FakeInvoiceLine[] = sub.items.data.map((item) => {
    const price = item.price;
    const product = ctx.store.get('product', price.product);
    const productName = product?.name ?? price.product;
    let quantity: number;
    let description: string;
    if (price.recurring?.usage_type === 'metered' && price.recurring.meter) {
      const meter = ctx.store.get('meter', price.recurring.meter);
      const events = ctx.store.unbilledMeterEvents(price.recurring.meter, sub.customer, options.usageUpTo);
      quantity = meter ? aggregate(meter.default_aggregation.formula, events) : 0;
      billedEventIds.push(...events.map((e) => e.event.identifier));
      const unit = product?.unit_label ?? 'unit';
      description = `${quantity} × ${productName} (at ${formatMoney(price.unit_amount, price.currency)} / ${unit})`;
    } else {
      quantity = item.quantity ?? 1;
      const every = price.recurring?.interval ?? 'month';
      description = `${quantity} × ${productName} (at ${formatMoney(price.unit_amount, price.currency)} / ${every})`;
    }
    if (options.trial) description = `Trial period for ${productName}: ${description}`;
    const amount = options.trial ? 0 : quantity * price.unit_amount;
    return {
      id: newId('il'),
      object: 'line_item',
      amount,
      currency: price.currency,
      description,
      discount_amounts: [],
      discountable: true,
      discounts: [],
      invoice: id,
      livemode: false,
      metadata: {},
      parent: {
        type: 'subscription_item_details',
        invoice_item_details: null,
        subscription_item_details: {
          invoice_item: null,
          proration: false,
          proration_details: null,
          subscription: sub.id,
          subscription_item: item.id,
        },
      },
      period: { start: period.start, end: period.end },
      pretax_credit_amounts: [],
      pricing: {
        type: 'price_details',
        price_details: { price: price.id, product: price.product },
        unit_amount_decimal: options.trial ? '0' : price.unit_amount_decimal,
      },
      quantity,
      subscription: sub.id,
      subtotal: amount,
      taxes: [],
    };
  });
  const total = lines.reduce((sum, line) => sum + line.amount, 0);
  const invoice: FakeInvoice = {
    id,
    object: 'invoice',
    account_country: 'US',
    account_name: 'Tropopass',
    amount_due: total,
    amount_overpaid: 0,
    amount_paid: 0,
    amount_remaining: total,
    amount_shipping: 0,
    attempt_count: 0,
    attempted: false,
    auto_advance: !options.preview,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
    billing_reason: options.preview ? 'upcoming' : 'subscription_cycle',
    collection_method: 'charge_automatically',
    created: ctx.now,
    currency: sub.currency,
    customer: sub.customer,
    customer_email: customer.email,
    customer_name: customer.name,
    default_payment_method: null,
    description: null,
    discounts: [],
    due_date: null,
    effective_at: options.preview ? null : ctx.now,
    ending_balance: options.preview ? null : 0,
    hosted_invoice_url: null,
    invoice_pdf: null,
    last_finalization_error: null,
    lines: listBody(`/v1/invoices/${id}/lines`, lines, false),
    livemode: false,
    metadata: {},
    next_payment_attempt: null,
    number: options.preview
      ? null
      : `${customer.invoice_prefix}-${String(customer.next_invoice_sequence).padStart(4, '0')}`,
    parent: {
      type: 'subscription_details',
      quote_details: null,
      subscription_details: { metadata: clone(sub.metadata), subscription: sub.id },
    },
    period_end: period.end,
    period_start: period.start,
    starting_balance: 0,
    status: options.preview ? 'draft' : 'open',
    status_transitions: {
      finalized_at: options.preview ? null : ctx.now,
      marked_uncollectible_at: null,
      paid_at: null,
      voided_at: null,
    },
    subtotal: total,
    subtotal_excluding_tax: total,
    total,
    total_excluding_tax: total,
    webhooks_delivered_at: null,
  };
  return { invoice, billedEventIds };
}

type Settlement = { paid: true } | { paid: false; paymentMethod: string | null };

/** Charges an open invoice: $0 is paid at once; otherwise the payment method decides. Emits the event. */
function settleInvoice(
  ctx: ApiContext,
  invoice: FakeInvoice,
  sub: FakeSubscription | undefined,
  paymentMethodOverride?: string,
): Settlement {
  const customer = ctx.store.get('customer', invoice.customer);
  const pm =
    paymentMethodOverride ?? sub?.default_payment_method ?? customer?.invoice_settings.default_payment_method ?? null;
  let paid = invoice.amount_due === 0;
  if (!paid) {
    invoice.attempt_count += 1;
    invoice.attempted = true;
    paid = pm !== null && cardBehavior(ctx, pm) === 'succeed';
  }
  if (paid) {
    invoice.status = 'paid';
    invoice.attempted = true;
    invoice.amount_paid = invoice.amount_due;
    invoice.amount_remaining = 0;
    invoice.status_transitions.paid_at = ctx.now;
    invoice.next_payment_attempt = null;
    ctx.store.save('invoice', invoice);
    ctx.emit('invoice.paid', invoice);
    return { paid: true };
  }
  invoice.next_payment_attempt = ctx.now + RETRY_AFTER_SECONDS;
  ctx.store.save('invoice', invoice);
  ctx.emit('invoice.payment_failed', invoice);
  return { paid: false, paymentMethod: pm };
}

/**
 * Closes the subscription's open period now: bills it with the unbilled usage stamped up to
 * `usageUpTo`, charges it, then either starts the next period or, when `cancel_at_period_end` (or
 * `cancelAfter`) is set, cancels. Mutates `sub` and saves it; the caller emits the subscription event.
 */
function closePeriodInPlace(
  ctx: ApiContext,
  sub: FakeSubscription,
  cancelAfter: boolean,
  usageUpTo: number,
): { invoice: FakeInvoice; canceled: boolean } {
  const customer = requireCustomer(ctx, sub.customer);
  const { start } = periodOf(sub);
  const end = Math.max(ctx.now, start);
  const trial = sub.status === 'trialing';
  const { invoice, billedEventIds } = buildInvoice(
    ctx,
    sub,
    customer,
    { start, end },
    { trial, preview: false, usageUpTo },
  );
  ctx.store.insert('invoice', invoice, {});
  ctx.store.markMeterEventsBilled(billedEventIds, invoice.id);
  customer.next_invoice_sequence += 1;
  ctx.store.save('customer', customer);
  sub.latest_invoice = invoice.id;
  const settlement = settleInvoice(ctx, invoice, sub);
  if (trial) sub.trial_end = end;
  sub.status = settlement.paid ? 'active' : 'past_due';
  const canceled = cancelAfter || sub.cancel_at_period_end;
  if (canceled) {
    sub.status = 'canceled';
    sub.ended_at = end;
    sub.canceled_at = sub.canceled_at ?? end;
    sub.cancel_at = sub.cancel_at_period_end ? end : sub.cancel_at;
    sub.cancellation_details.reason = 'cancellation_requested';
  } else {
    const cadence = cadenceOf(sub);
    setPeriod(sub, end, addInterval(end, cadence.interval, cadence.count));
    if (sub.cancel_at !== null) sub.cancel_at = periodOf(sub).end;
  }
  ctx.store.save('subscription', sub);
  return { invoice, canceled };
}

/**
 * `POST /_fake/advance`: closes the current period of a subscription at `ctx.now`, which becomes the
 * next period's start. Usage stamped before `ctx.now` is billed now; usage stamped `ctx.now` or later
 * belongs to the next period, as event summaries over the periods show. The caller makes sure no
 * event of this customer is already stamped `ctx.now` (see `needsSecondBoundary`).
 */
export function advanceSubscription(
  ctx: ApiContext,
  id: string,
): { subscription: FakeSubscription; invoice: FakeInvoice } {
  const sub = requireSubscription(ctx, id, 'subscription');
  if (sub.status === 'canceled')
    throw invalidRequest(`Subscription ${id} is canceled; there is no period to close.`, 'subscription');
  const before = clone(sub);
  const { invoice, canceled } = closePeriodInPlace(ctx, sub, false, ctx.now - 1);
  if (canceled) ctx.emit('customer.subscription.deleted', sub);
  else ctx.emit('customer.subscription.updated', sub, previousAttributes(before, sub));
  return { subscription: sub, invoice: requireInvoice(ctx, invoice.id) };
}

/** Whether closing this subscription's period right now would split a second that already has usage. */
export function needsSecondBoundary(ctx: Pick<ApiContext, 'store'>, id: string, now: number): boolean {
  const sub = ctx.store.get('subscription', id);
  return sub !== undefined && ctx.store.hasMeterEventAt(sub.customer, now);
}

/** After an invoice of a past-due subscription is paid, the subscription is active again. */
function afterInvoicePaid(ctx: ApiContext, sub: FakeSubscription, invoice: FakeInvoice): boolean {
  if (sub.status !== 'past_due') return false;
  const stillOpen = ctx.store
    .list('invoice', { subscription: sub.id }, { limit: 100 })
    .data.some((inv) => inv.status === 'open' && inv.id !== invoice.id);
  if (stillOpen && sub.latest_invoice !== invoice.id) return false;
  sub.status = 'active';
  return true;
}

export function updateSubscription(ctx: ApiContext, params: Params, id: string): FakeSubscription {
  params.allowOnly([
    ...SUBSCRIPTION_IGNORED,
    'items',
    'cancel_at_period_end',
    'default_payment_method',
    'metadata',
    'description',
    'trial_end',
  ]);
  const sub = requireSubscription(ctx, id);
  const before = clone(sub);
  if (sub.status === 'canceled') {
    const allowedOnCanceled = ['metadata', 'expand'];
    if (params.keys().some((k) => !allowedOnCanceled.includes(k))) {
      throw invalidRequest('A canceled subscription can only update its cancellation_details and metadata.');
    }
  }

  const itemParams = params.objList('items');
  if (itemParams) {
    let items = clone(sub.items.data);
    const period = periodOf(sub);
    itemParams.forEach((item, i) => {
      item.allowOnly(['id', 'price', 'quantity', 'deleted', 'metadata', 'clear_usage', 'tax_rates', 'discounts']);
      const itemId = item.str('id');
      if (itemId) {
        const index = items.findIndex((x) => x.id === itemId);
        if (index < 0) throw resourceMissing('subscription item', itemId, `items[${i}][id]`);
        if (item.bool('deleted')) {
          items.splice(index, 1);
          return;
        }
        const current = items[index];
        const priceId = item.str('price');
        if (priceId && priceId !== current.price.id)
          current.price = clone(recurringPrice(ctx, priceId, `items[${i}][price]`));
        const quantity = itemQuantity(item, current.price, `items[${i}][quantity]`);
        if (quantity === undefined) delete current.quantity;
        else if (item.has('quantity') || current.quantity === undefined) current.quantity = quantity;
        current.metadata = applyMetadata(current.metadata, item.metadata());
        return;
      }
      if (item.bool('deleted')) throw invalidRequest('items[].deleted needs items[].id.', `items[${i}][deleted]`);
      const price = recurringPrice(ctx, item.requireStr('price'), `items[${i}][price]`);
      items.push(
        buildItem(
          sub.id,
          {
            price,
            quantity: itemQuantity(item, price, `items[${i}][quantity]`),
            metadata: applyMetadata({}, item.metadata()),
          },
          ctx.now,
          period,
        ),
      );
    });
    items = items.map((x) => ({ ...x, current_period_start: period.start, current_period_end: period.end }));
    checkItems(items);
    sub.items = itemsList(sub.id, items);
    sub.currency = items[0].price.currency;
  }

  const cancelAtPeriodEnd = params.bool('cancel_at_period_end');
  if (cancelAtPeriodEnd !== undefined && cancelAtPeriodEnd !== sub.cancel_at_period_end) {
    sub.cancel_at_period_end = cancelAtPeriodEnd;
    sub.cancel_at = cancelAtPeriodEnd ? periodOf(sub).end : null;
    sub.canceled_at = cancelAtPeriodEnd ? ctx.now : null;
    sub.cancellation_details.reason = cancelAtPeriodEnd ? 'cancellation_requested' : null;
  }

  const description = params.nullableStr('description');
  if (description !== undefined) sub.description = description;
  sub.metadata = applyMetadata(sub.metadata, params.metadata());

  const pmParam = params.nullableStr('default_payment_method');
  let paymentMethodChanged = false;
  if (pmParam !== undefined) {
    const next = pmParam === null ? null : resolvePaymentMethod(ctx, sub.customer, pmParam, 'default_payment_method');
    paymentMethodChanged = next !== sub.default_payment_method;
    sub.default_payment_method = next;
  }

  const trialEndRaw = params.str('trial_end');
  let invoiceClosed = false;
  if (trialEndRaw !== undefined) {
    if (sub.status !== 'trialing') {
      throw invalidRequest(
        'The payment fake can only change trial_end while the subscription is trialing.',
        'trial_end',
      );
    }
    if (trialEndRaw === 'now') {
      ctx.store.save('subscription', sub);
      closePeriodInPlace(ctx, sub, false, ctx.now);
      invoiceClosed = true;
    } else {
      const t = params.requireInt('trial_end');
      if (t <= ctx.now)
        throw invalidRequest('Invalid timestamp: must be an integer Unix timestamp in the future.', 'trial_end');
      sub.trial_end = t;
      setPeriod(sub, periodOf(sub).start, t);
    }
  }

  ctx.store.save('subscription', sub);

  // The payment API would retry on its own schedule; the fake retries at once when the card changes.
  if (!invoiceClosed && paymentMethodChanged && sub.status === 'past_due' && sub.default_payment_method) {
    const open = ctx.store
      .list('invoice', { subscription: sub.id }, { limit: 100 })
      .data.filter((inv) => inv.status === 'open')
      .reverse();
    for (const invoice of open) {
      const result = settleInvoice(ctx, invoice, sub);
      if (result.paid) afterInvoicePaid(ctx, sub, invoice);
    }
    ctx.store.save('subscription', sub);
  }

  const previous = previousAttributes(before, sub);
  if (Object.keys(previous).length > 0) ctx.emit('customer.subscription.updated', sub, previous);
  return sub;
}

export function cancelSubscription(ctx: ApiContext, params: Params, id: string): FakeSubscription {
  params.allowOnly(['invoice_now', 'prorate', 'cancellation_details', 'expand']);
  const sub = requireSubscription(ctx, id);
  if (sub.status === 'canceled') {
    throw invalidRequest(`No such subscription: '${id}' is already canceled.`, undefined, 'resource_missing');
  }
  const details = params.obj('cancellation_details');
  details?.allowOnly(['comment', 'feedback']);
  if (params.bool('invoice_now')) {
    closePeriodInPlace(ctx, sub, true, ctx.now);
  } else {
    sub.status = 'canceled';
    sub.canceled_at = ctx.now;
    sub.ended_at = ctx.now;
    sub.cancellation_details.reason = 'cancellation_requested';
  }
  sub.cancellation_details.comment = details?.nullableStr('comment') ?? sub.cancellation_details.comment;
  ctx.store.save('subscription', sub);
  ctx.emit('customer.subscription.deleted', sub);
  return sub;
}

export function retrieveInvoice(ctx: ApiContext, params: Params, id: string): FakeInvoice {
  params.allowOnly(['expand']);
  return requireInvoice(ctx, id);
}

const INVOICE_STATUSES = ['draft', 'open', 'paid', 'uncollectible', 'void'] as const;

export function listInvoices(ctx: ApiContext, params: Params) {
  params.allowOnly([...PAGE_PARAMS, 'customer', 'subscription', 'status', 'created', 'collection_method', 'due_date']);
  const status = params.oneOf('status', INVOICE_STATUSES);
  const { data, hasMore } = ctx.store.list(
    'invoice',
    {
      customer: params.str('customer'),
      subscription: params.str('subscription'),
      where: (inv) => status === undefined || inv.status === status,
    },
    readPage(params),
  );
  return listBody('/v1/invoices', data, hasMore);
}

export function listInvoiceLines(ctx: ApiContext, params: Params, id: string) {
  params.allowOnly([...PAGE_PARAMS]);
  const invoice = requireInvoice(ctx, id);
  return invoice.lines;
}

export function payInvoice(ctx: ApiContext, params: Params, id: string): FakeInvoice | Reply {
  params.allowOnly(['payment_method', 'paid_out_of_band', 'off_session', 'forgive', 'expand', 'source', 'mandate']);
  const invoice = requireInvoice(ctx, id);
  if (invoice.status === 'paid') throw invalidRequest('Invoice is already paid.', undefined, 'invoice_already_paid');
  if (invoice.status !== 'open') throw invalidRequest(`This invoice is ${invoice.status} and cannot be paid.`);
  const sub = ctx.store.get('subscription', invoice.parent.subscription_details.subscription);
  const pmParam = params.str('payment_method');
  const override = pmParam ? resolvePaymentMethod(ctx, invoice.customer, pmParam, 'payment_method') : undefined;
  if (params.bool('paid_out_of_band')) {
    settleInvoiceOutOfBand(ctx, invoice);
  } else {
    const customer = ctx.store.get('customer', invoice.customer);
    const pm = override ?? sub?.default_payment_method ?? customer?.invoice_settings.default_payment_method ?? null;
    if (pm === null && invoice.amount_due > 0) {
      throw invalidRequest(
        'This customer has no attached payment source or default payment method. Please consider adding a default payment method.',
        undefined,
        'invoice_no_payment_method',
      );
    }
    const result = settleInvoice(ctx, invoice, sub, override);
    if (!result.paid) return new Reply(402, { error: cardDeclined(result.paymentMethod ?? 'unknown').body });
  }
  if (sub) {
    const before = clone(sub);
    if (afterInvoicePaid(ctx, sub, invoice)) {
      ctx.store.save('subscription', sub);
      ctx.emit('customer.subscription.updated', sub, previousAttributes(before, sub));
    }
  }
  return invoice;
}

function settleInvoiceOutOfBand(ctx: ApiContext, invoice: FakeInvoice): void {
  invoice.status = 'paid';
  invoice.amount_paid = invoice.amount_due;
  invoice.amount_remaining = 0;
  invoice.status_transitions.paid_at = ctx.now;
  invoice.next_payment_attempt = null;
  ctx.store.save('invoice', invoice);
  ctx.emit('invoice.paid', invoice);
}

/** `POST /v1/invoices/create_preview`: what closing the current period right now would bill. */
export function createInvoicePreview(ctx: ApiContext, params: Params): FakeInvoice {
  params.allowOnly(['customer', 'subscription', 'expand', 'automatic_tax', 'subscription_details']);
  const subId = params.str('subscription');
  const customerId = params.str('customer');
  let sub: FakeSubscription | undefined;
  if (subId) sub = requireSubscription(ctx, subId, 'subscription');
  else if (customerId) {
    requireCustomer(ctx, customerId, 'customer');
    sub = ctx.store.list('subscription', { customer: customerId, where: (s) => s.status !== 'canceled' }, { limit: 1 })
      .data[0];
  } else {
    throw invalidRequest('Missing required param: customer or subscription.', 'subscription', 'parameter_missing');
  }
  if (!sub || sub.status === 'canceled') {
    throw new FakeApiError(404, {
      type: 'invalid_request_error',
      code: 'invoice_upcoming_none',
      message: 'No upcoming invoices for customer.',
    });
  }
  const customer = requireCustomer(ctx, sub.customer);
  const period = periodOf(sub);
  return buildInvoice(ctx, sub, customer, period, {
    trial: sub.status === 'trialing',
    preview: true,
    usageUpTo: ctx.now + 300,
  }).invoice;
}
