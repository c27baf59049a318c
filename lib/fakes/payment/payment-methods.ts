import { createHash } from 'node:crypto';
import { PAGE_PARAMS, listBody, readPage, type ApiContext } from './common';
import { invalidRequest, resourceMissing } from './errors';
import { applyMetadata, type Params } from './form';
import { newId } from './ids';
import type { CardBehavior } from './store';
import type { FakePaymentMethod } from './types';

interface TestCard {
  brand: string;
  last4: string;
  behavior: CardBehavior;
}

/**
 * The test payment methods and card tokens the fake knows. Attaching any of them succeeds; the
 * declining ones fail when an invoice is charged, with `card_declined`.
 */
export const TEST_CARDS: Readonly<Record<string, TestCard>> = {
  pm_card_visa: { brand: 'visa', last4: '4242', behavior: 'succeed' },
  pm_card_mastercard: { brand: 'mastercard', last4: '4444', behavior: 'succeed' },
  pm_card_chargeDeclined: { brand: 'visa', last4: '0002', behavior: 'decline' },
  pm_card_chargeCustomerFail: { brand: 'visa', last4: '0341', behavior: 'decline' },
  tok_visa: { brand: 'visa', last4: '4242', behavior: 'succeed' },
  tok_mastercard: { brand: 'mastercard', last4: '4444', behavior: 'succeed' },
  tok_chargeDeclined: { brand: 'visa', last4: '0002', behavior: 'decline' },
  tok_chargeCustomerFail: { brand: 'visa', last4: '0341', behavior: 'decline' },
};

function buildPaymentMethod(ctx: ApiContext, card: TestCard, customer: string | null): FakePaymentMethod {
  const expYear = new Date(ctx.now * 1000).getUTCFullYear() + 3;
  return {
    id: newId('pm'),
    object: 'payment_method',
    allow_redisplay: 'unspecified',
    billing_details: { address: null, email: null, name: null, phone: null, tax_id: null },
    card: {
      brand: card.brand,
      checks: null,
      country: 'US',
      display_brand: card.brand,
      exp_month: 12,
      exp_year: expYear,
      fingerprint: createHash('sha256').update(`${card.brand}${card.last4}`).digest('base64url').slice(0, 16),
      funding: 'credit',
      generated_from: null,
      last4: card.last4,
      networks: { available: [card.brand], preferred: null },
      regulated_status: 'unregulated',
      three_d_secure_usage: { supported: true },
      wallet: null,
    },
    created: ctx.now,
    customer,
    customer_account: null,
    livemode: false,
    metadata: {},
    type: 'card',
  };
}

function requirePaymentMethod(ctx: ApiContext, id: string, param?: string): FakePaymentMethod {
  const pm = ctx.store.get('payment_method', id);
  if (!pm) throw resourceMissing('PaymentMethod', id, param);
  return pm;
}

/**
 * The id of a payment method attached to `customerId`. A test token (`pm_card_visa`, ...) is attached
 * on the spot, as the API does for `customers.create({ payment_method })`; the fake also accepts one
 * wherever a default payment method is set.
 */
export function resolvePaymentMethod(ctx: ApiContext, customerId: string, value: string, param: string): string {
  const card = TEST_CARDS[value];
  if (card) {
    const already = ctx.attachedTokens.get(value);
    if (already) return already;
    const pm = buildPaymentMethod(ctx, card, customerId);
    ctx.store.insert('payment_method', pm, { behavior: card.behavior });
    ctx.attachedTokens.set(value, pm.id);
    return pm.id;
  }
  const pm = requirePaymentMethod(ctx, value, param);
  if (pm.customer !== customerId) {
    throw invalidRequest(
      `The customer does not have a payment method with the ID ${value}. The payment method must be attached to the customer.`,
      param,
      'resource_missing',
    );
  }
  return pm.id;
}

export function cardBehavior(ctx: ApiContext, paymentMethodId: string): CardBehavior {
  return ctx.store.internal('payment_method', paymentMethodId)?.behavior ?? 'decline';
}

export function createPaymentMethod(ctx: ApiContext, params: Params): FakePaymentMethod {
  params.allowOnly(['type', 'card', 'billing_details', 'metadata', 'expand', 'allow_redisplay']);
  const type = params.requireStr('type');
  if (type !== 'card') throw invalidRequest(`The payment fake only supports type=card.`, 'type');
  const cardParams = params.obj('card');
  const token = cardParams?.str('token');
  if (!token) {
    throw invalidRequest(
      'Pass card[token] with a test token (tok_visa, tok_chargeDeclined, ...); raw card numbers are not accepted.',
      'card[token]',
      'parameter_missing',
    );
  }
  const card = TEST_CARDS[token];
  if (!card) throw resourceMissing('token', token, 'card[token]');
  const pm = buildPaymentMethod(ctx, card, null);
  const details = params.obj('billing_details');
  if (details) {
    details.allowOnly(['email', 'name', 'phone', 'address']);
    pm.billing_details.email = details.nullableStr('email') ?? null;
    pm.billing_details.name = details.nullableStr('name') ?? null;
    pm.billing_details.phone = details.nullableStr('phone') ?? null;
  }
  pm.metadata = applyMetadata(pm.metadata, params.metadata());
  ctx.store.insert('payment_method', pm, { behavior: card.behavior });
  return pm;
}

export function retrievePaymentMethod(ctx: ApiContext, params: Params, id: string): FakePaymentMethod {
  params.allowOnly(['expand']);
  return requirePaymentMethod(ctx, id);
}

export function updatePaymentMethod(ctx: ApiContext, params: Params, id: string): FakePaymentMethod {
  params.allowOnly(['metadata', 'billing_details', 'expand', 'allow_redisplay']);
  const pm = requirePaymentMethod(ctx, id);
  pm.metadata = applyMetadata(pm.metadata, params.metadata());
  const details = params.obj('billing_details');
  if (details) {
    details.allowOnly(['email', 'name', 'phone', 'address']);
    const email = details.nullableStr('email');
    if (email !== undefined) pm.billing_details.email = email;
    const name = details.nullableStr('name');
    if (name !== undefined) pm.billing_details.name = name;
  }
  ctx.store.save('payment_method', pm);
  return pm;
}

export function attachPaymentMethod(ctx: ApiContext, params: Params, id: string): FakePaymentMethod {
  params.allowOnly(['customer', 'expand']);
  const customerId = params.requireStr('customer');
  const customer = ctx.store.get('customer', customerId);
  if (!customer || ctx.store.internal('customer', customerId)?.deleted) {
    throw resourceMissing('customer', customerId, 'customer');
  }
  const card = TEST_CARDS[id];
  if (card) {
    const pm = buildPaymentMethod(ctx, card, customerId);
    ctx.store.insert('payment_method', pm, { behavior: card.behavior });
    return pm;
  }
  const pm = requirePaymentMethod(ctx, id);
  if (pm.customer && pm.customer !== customerId) {
    throw invalidRequest(
      'The payment method you provided has already been attached to a customer.',
      undefined,
      'payment_method_unexpected_state',
    );
  }
  pm.customer = customerId;
  ctx.store.save('payment_method', pm);
  return pm;
}

export function detachPaymentMethod(ctx: ApiContext, params: Params, id: string): FakePaymentMethod {
  params.allowOnly(['expand']);
  const pm = requirePaymentMethod(ctx, id);
  if (!pm.customer) {
    throw invalidRequest(
      'The payment method you provided is not attached to a customer so detachment is impossible.',
      undefined,
      'payment_method_unexpected_state',
    );
  }
  const customer = ctx.store.get('customer', pm.customer);
  if (customer && customer.invoice_settings.default_payment_method === id) {
    customer.invoice_settings.default_payment_method = null;
    ctx.store.save('customer', customer);
  }
  pm.customer = null;
  ctx.store.save('payment_method', pm);
  return pm;
}

export function listPaymentMethods(ctx: ApiContext, params: Params, customerFromPath?: string) {
  params.allowOnly([...PAGE_PARAMS, 'customer', 'type', 'allow_redisplay']);
  const customer = customerFromPath ?? params.str('customer');
  if (customerFromPath) {
    const c = ctx.store.get('customer', customerFromPath);
    if (!c) throw resourceMissing('customer', customerFromPath);
  }
  const type = params.str('type');
  if (type !== undefined && type !== 'card') return listBody('/v1/payment_methods', [], false);
  const { data, hasMore } = ctx.store.list(
    'payment_method',
    customer === undefined ? { where: () => false } : { customer },
    readPage(params),
  );
  const url = customerFromPath ? `/v1/customers/${customerFromPath}/payment_methods` : '/v1/payment_methods';
  return listBody(url, data, hasMore);
}
