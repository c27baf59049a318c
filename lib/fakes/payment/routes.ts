import {
  cancelSubscription,
  createInvoicePreview,
  createSubscription,
  listInvoiceLines,
  listInvoices,
  listSubscriptions,
  payInvoice,
  retrieveInvoice,
  retrieveSubscription,
  updateSubscription,
} from './billing';
import {
  createMeter,
  createPrice,
  createProduct,
  listMeters,
  listPrices,
  listProducts,
  retrieveMeter,
  retrievePrice,
  retrieveProduct,
  setMeterStatus,
  updateMeter,
  updatePrice,
  updateProduct,
} from './catalogue';
import { PAGE_PARAMS, listBody, readPage, type Handler } from './common';
import { createCustomer, deleteCustomer, listCustomers, retrieveCustomer, updateCustomer } from './customers';
import { resourceMissing } from './errors';
import { createMeterEvent, listEventSummaries } from './meter-events';
import {
  attachPaymentMethod,
  createPaymentMethod,
  detachPaymentMethod,
  listPaymentMethods,
  retrievePaymentMethod,
  updatePaymentMethod,
} from './payment-methods';

export type Method = 'GET' | 'POST' | 'DELETE';

export interface Route {
  method: Method;
  pattern: RegExp;
  handler: Handler;
}

const ID = '([^/]+)';

function route(method: Method, path: string, handler: Handler): Route {
  return { method, pattern: new RegExp(`^${path.replaceAll('{id}', ID)}$`), handler };
}

/** The `/v1` surface the fake implements. */
export const ROUTES: Route[] = [
  route('POST', '/v1/customers', (ctx, p) => createCustomer(ctx, p)),
  route('GET', '/v1/customers', (ctx, p) => listCustomers(ctx, p)),
  route('GET', '/v1/customers/{id}', (ctx, p, [id]) => retrieveCustomer(ctx, p, id)),
  route('POST', '/v1/customers/{id}', (ctx, p, [id]) => updateCustomer(ctx, p, id)),
  route('DELETE', '/v1/customers/{id}', (ctx, p, [id]) => deleteCustomer(ctx, p, id)),
  route('GET', '/v1/customers/{id}/payment_methods', (ctx, p, [id]) => listPaymentMethods(ctx, p, id)),

  route('POST', '/v1/payment_methods', (ctx, p) => createPaymentMethod(ctx, p)),
  route('GET', '/v1/payment_methods', (ctx, p) => listPaymentMethods(ctx, p)),
  route('GET', '/v1/payment_methods/{id}', (ctx, p, [id]) => retrievePaymentMethod(ctx, p, id)),
  route('POST', '/v1/payment_methods/{id}', (ctx, p, [id]) => updatePaymentMethod(ctx, p, id)),
  route('POST', '/v1/payment_methods/{id}/attach', (ctx, p, [id]) => attachPaymentMethod(ctx, p, id)),
  route('POST', '/v1/payment_methods/{id}/detach', (ctx, p, [id]) => detachPaymentMethod(ctx, p, id)),

  route('POST', '/v1/products', (ctx, p) => createProduct(ctx, p)),
  route('GET', '/v1/products', (ctx, p) => listProducts(ctx, p)),
  route('GET', '/v1/products/{id}', (ctx, p, [id]) => retrieveProduct(ctx, p, id)),
  route('POST', '/v1/products/{id}', (ctx, p, [id]) => updateProduct(ctx, p, id)),

  route('POST', '/v1/prices', (ctx, p) => createPrice(ctx, p)),
  route('GET', '/v1/prices', (ctx, p) => listPrices(ctx, p)),
  route('GET', '/v1/prices/{id}', (ctx, p, [id]) => retrievePrice(ctx, p, id)),
  route('POST', '/v1/prices/{id}', (ctx, p, [id]) => updatePrice(ctx, p, id)),

  route('POST', '/v1/billing/meters', (ctx, p) => createMeter(ctx, p)),
  route('GET', '/v1/billing/meters', (ctx, p) => listMeters(ctx, p)),
  route('GET', '/v1/billing/meters/{id}', (ctx, p, [id]) => retrieveMeter(ctx, p, id)),
  route('POST', '/v1/billing/meters/{id}', (ctx, p, [id]) => updateMeter(ctx, p, id)),
  route('POST', '/v1/billing/meters/{id}/deactivate', (ctx, p, [id]) => setMeterStatus(ctx, p, id, 'inactive')),
  route('POST', '/v1/billing/meters/{id}/reactivate', (ctx, p, [id]) => setMeterStatus(ctx, p, id, 'active')),
  route('GET', '/v1/billing/meters/{id}/event_summaries', (ctx, p, [id]) => listEventSummaries(ctx, p, id)),
  route('POST', '/v1/billing/meter_events', (ctx, p) => createMeterEvent(ctx, p)),

  route('POST', '/v1/subscriptions', (ctx, p) => createSubscription(ctx, p)),
  route('GET', '/v1/subscriptions', (ctx, p) => listSubscriptions(ctx, p)),
  route('GET', '/v1/subscriptions/{id}', (ctx, p, [id]) => retrieveSubscription(ctx, p, id)),
  route('POST', '/v1/subscriptions/{id}', (ctx, p, [id]) => updateSubscription(ctx, p, id)),
  route('DELETE', '/v1/subscriptions/{id}', (ctx, p, [id]) => cancelSubscription(ctx, p, id)),

  route('POST', '/v1/invoices/create_preview', (ctx, p) => createInvoicePreview(ctx, p)),
  route('GET', '/v1/invoices', (ctx, p) => listInvoices(ctx, p)),
  route('GET', '/v1/invoices/{id}', (ctx, p, [id]) => retrieveInvoice(ctx, p, id)),
  route('GET', '/v1/invoices/{id}/lines', (ctx, p, [id]) => listInvoiceLines(ctx, p, id)),
  route('POST', '/v1/invoices/{id}/pay', (ctx, p, [id]) => payInvoice(ctx, p, id)),

  route('GET', '/v1/events', (ctx, p) => {
    p.allowOnly([...PAGE_PARAMS, 'type', 'types', 'created', 'delivery_success']);
    const type = p.str('type');
    const types = p.strList('types') ?? (type ? [type] : undefined);
    const { data, hasMore } = ctx.store.listEvents({ types }, readPage(p));
    return listBody('/v1/events', data, hasMore);
  }),
  route('GET', '/v1/events/{id}', (ctx, p, [id]) => {
    p.allowOnly(['expand']);
    const stored = ctx.store.getEvent(id);
    if (!stored) throw resourceMissing('event', id);
    return stored.event;
  }),
];

export function matchRoute(method: string, pathname: string): { route: Route; params: string[] } | 'method' | null {
  let pathMatched = false;
  for (const r of ROUTES) {
    const m = r.pattern.exec(pathname);
    if (!m) continue;
    pathMatched = true;
    if (r.method === method) return { route: r, params: m.slice(1).map((s) => decodeURIComponent(s)) };
  }
  return pathMatched ? 'method' : null;
}
