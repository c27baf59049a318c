import { PAGE_PARAMS, listBody, readPage, type ApiContext } from './common';
import { invalidRequest, resourceMissing } from './errors';
import { applyMetadata, type Params } from './form';
import { newId, newInvoicePrefix } from './ids';
import { resolvePaymentMethod } from './payment-methods';
import type { DeletedCustomerStub, FakeCustomer } from './types';

const WRITABLE = ['email', 'name', 'description', 'phone', 'metadata', 'invoice_settings', 'expand'] as const;

/** A live customer, or the API's error: 404 for a path id, 400 naming `param` for a parameter. */
export function requireCustomer(ctx: ApiContext, id: string, param?: string): FakeCustomer {
  const customer = ctx.store.get('customer', id);
  const internal = ctx.store.internal('customer', id);
  if (!customer || internal?.deleted) throw resourceMissing('customer', id, param);
  return customer;
}

function applyWritable(ctx: ApiContext, customer: FakeCustomer, params: Params): void {
  const email = params.nullableStr('email');
  if (email !== undefined) customer.email = email;
  const name = params.nullableStr('name');
  if (name !== undefined) customer.name = name;
  const description = params.nullableStr('description');
  if (description !== undefined) customer.description = description;
  const phone = params.nullableStr('phone');
  if (phone !== undefined) customer.phone = phone;
  customer.metadata = applyMetadata(customer.metadata, params.metadata());
  const settings = params.obj('invoice_settings');
  if (settings) {
    settings.allowOnly(['default_payment_method', 'footer', 'custom_fields', 'rendering_options']);
    const pm = settings.nullableStr('default_payment_method');
    if (pm === null) customer.invoice_settings.default_payment_method = null;
    else if (pm !== undefined) {
      customer.invoice_settings.default_payment_method = resolvePaymentMethod(
        ctx,
        customer.id,
        pm,
        settings.name('default_payment_method'),
      );
    }
    const footer = settings.nullableStr('footer');
    if (footer !== undefined) customer.invoice_settings.footer = footer;
  }
}

export function createCustomer(ctx: ApiContext, params: Params): FakeCustomer {
  params.allowOnly([...WRITABLE, 'payment_method', 'address', 'preferred_locales', 'tax_exempt']);
  const customer: FakeCustomer = {
    id: newId('cus'),
    object: 'customer',
    address: null,
    balance: 0,
    created: ctx.now,
    currency: null,
    default_source: null,
    delinquent: false,
    description: null,
    email: null,
    invoice_prefix: newInvoicePrefix(),
    invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
    livemode: false,
    metadata: {},
    name: null,
    next_invoice_sequence: 1,
    phone: null,
    preferred_locales: [],
    shipping: null,
    tax_exempt: 'none',
    test_clock: null,
  };
  ctx.store.insert('customer', customer, { deleted: false });
  const pm = params.str('payment_method');
  if (pm) resolvePaymentMethod(ctx, customer.id, pm, 'payment_method');
  applyWritable(ctx, customer, params);
  ctx.store.save('customer', customer);
  return customer;
}

export function retrieveCustomer(ctx: ApiContext, params: Params, id: string): FakeCustomer | DeletedCustomerStub {
  params.allowOnly(['expand']);
  const customer = ctx.store.get('customer', id);
  if (!customer) throw resourceMissing('customer', id);
  if (ctx.store.internal('customer', id)?.deleted) return { id, object: 'customer', deleted: true };
  return customer;
}

export function updateCustomer(ctx: ApiContext, params: Params, id: string): FakeCustomer {
  params.allowOnly([...WRITABLE, 'address', 'preferred_locales', 'tax_exempt']);
  const customer = requireCustomer(ctx, id);
  applyWritable(ctx, customer, params);
  ctx.store.save('customer', customer);
  return customer;
}

export function deleteCustomer(ctx: ApiContext, params: Params, id: string): DeletedCustomerStub {
  params.allowOnly([]);
  const customer = requireCustomer(ctx, id);
  for (const sub of ctx.store.list('subscription', { customer: id }, { limit: 100 }).data) {
    if (sub.status !== 'canceled') {
      throw invalidRequest('Cancel the subscriptions of this customer before deleting it (payment fake).', 'customer');
    }
  }
  ctx.store.save('customer', customer, { deleted: true });
  return { id, object: 'customer', deleted: true };
}

export function listCustomers(ctx: ApiContext, params: Params) {
  params.allowOnly([...PAGE_PARAMS, 'email', 'created', 'test_clock']);
  const email = params.str('email');
  const page = readPage(params);
  const deleted = new Set(
    ctx.store
      .all('customer')
      .filter((c) => ctx.store.internal('customer', c.id)?.deleted)
      .map((c) => c.id),
  );
  const { data, hasMore } = ctx.store.list(
    'customer',
    { where: (c) => !deleted.has(c.id) && (email === undefined || c.email === email) },
    page,
  );
  return listBody('/v1/customers', data, hasMore);
}
