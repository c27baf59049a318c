import type Stripe from 'stripe';

/**
 * Wire shapes the fake stores and returns. Field names and meanings follow the payment API; the
 * `ShapeChecks` at the end make the compiler prove each shape is assignable to the SDK's own type for
 * the fields it has, so the SDK's typed methods read them correctly. Decimal fields are plain strings on
 * the wire (the SDK turns some into Decimal objects), so they are left out of those checks.
 */

export type Metadata = Record<string, string>;

export interface FakeList<T> {
  object: 'list';
  data: T[];
  has_more: boolean;
  url: string;
}

export interface FakeCustomer {
  id: string;
  object: 'customer';
  address: null;
  balance: number;
  created: number;
  currency: string | null;
  default_source: null;
  delinquent: boolean;
  description: string | null;
  email: string | null;
  invoice_prefix: string;
  invoice_settings: {
    custom_fields: null;
    default_payment_method: string | null;
    footer: string | null;
    rendering_options: null;
  };
  livemode: false;
  metadata: Metadata;
  name: string | null;
  next_invoice_sequence: number;
  phone: string | null;
  preferred_locales: string[];
  shipping: null;
  tax_exempt: 'none';
  test_clock: null;
}

export interface DeletedCustomerStub {
  id: string;
  object: 'customer';
  deleted: true;
}

export interface FakeCard {
  brand: string;
  checks: null;
  country: string;
  display_brand: string;
  exp_month: number;
  exp_year: number;
  fingerprint: string;
  funding: string;
  generated_from: null;
  last4: string;
  networks: { available: string[]; preferred: null };
  regulated_status: 'unregulated';
  three_d_secure_usage: { supported: boolean };
  wallet: null;
}

export interface FakePaymentMethod {
  id: string;
  object: 'payment_method';
  allow_redisplay: 'unspecified';
  billing_details: {
    address: null;
    email: string | null;
    name: string | null;
    phone: string | null;
    tax_id: null;
  };
  card: FakeCard;
  created: number;
  customer: string | null;
  customer_account: null;
  livemode: false;
  metadata: Metadata;
  type: 'card';
}

export interface FakeProduct {
  id: string;
  object: 'product';
  active: boolean;
  created: number;
  default_price: string | null;
  description: string | null;
  images: string[];
  livemode: false;
  marketing_features: [];
  metadata: Metadata;
  name: string;
  package_dimensions: null;
  shippable: null;
  statement_descriptor: null;
  tax_code: null;
  tax_details: null;
  type: 'service';
  unit_label: string | null;
  updated: number;
  url: null;
}

export type UsageType = 'licensed' | 'metered';

export interface FakePrice {
  id: string;
  object: 'price';
  active: boolean;
  billing_scheme: 'per_unit';
  created: number;
  currency: string;
  custom_unit_amount: null;
  livemode: false;
  lookup_key: string | null;
  metadata: Metadata;
  nickname: string | null;
  product: string;
  recurring: {
    interval: 'day' | 'week' | 'month' | 'year';
    interval_count: number;
    meter: string | null;
    trial_period_days: null;
    usage_type: UsageType;
  } | null;
  tax_behavior: 'unspecified';
  tiers_mode: null;
  transform_quantity: null;
  type: 'recurring' | 'one_time';
  unit_amount: number;
  unit_amount_decimal: string;
}

export type AggregationFormula = 'sum' | 'count' | 'last';

export interface FakeMeter {
  id: string;
  object: 'billing.meter';
  created: number;
  customer_mapping: { event_payload_key: string; type: 'by_id' };
  default_aggregation: { formula: AggregationFormula };
  display_name: string;
  event_name: string;
  event_time_window: null;
  livemode: false;
  status: 'active' | 'inactive';
  status_transitions: { deactivated_at: number | null };
  updated: number;
  value_settings: { event_payload_key: string };
}

export interface FakeMeterEvent {
  object: 'billing.meter_event';
  created: number;
  event_name: string;
  identifier: string;
  livemode: false;
  payload: Record<string, string>;
  timestamp: number;
}

export interface FakeMeterEventSummary {
  id: string;
  object: 'billing.meter_event_summary';
  aggregated_value: number;
  end_time: number;
  livemode: false;
  meter: string;
  start_time: number;
}

export interface FakeSubscriptionItem {
  id: string;
  object: 'subscription_item';
  billing_thresholds: null;
  created: number;
  current_period_end: number;
  current_period_start: number;
  discounts: [];
  metadata: Metadata;
  price: FakePrice;
  /** Absent on metered items, as in the API. */
  quantity?: number;
  subscription: string;
  tax_rates: [];
}

export type SubscriptionStatus = 'trialing' | 'active' | 'past_due' | 'canceled';

export interface FakeSubscription {
  id: string;
  object: 'subscription';
  application: null;
  application_fee_percent: null;
  automatic_tax: { disabled_reason: null; enabled: false; liability: null };
  billing_cycle_anchor: number;
  billing_cycle_anchor_config: null;
  billing_thresholds: null;
  cancel_at: number | null;
  cancel_at_period_end: boolean;
  canceled_at: number | null;
  cancellation_details: {
    comment: string | null;
    feedback: null;
    feedback_option: null;
    reason: 'cancellation_requested' | null;
  };
  collection_method: 'charge_automatically';
  created: number;
  currency: string;
  customer: string;
  customer_account: null;
  days_until_due: null;
  default_payment_method: string | null;
  default_source: null;
  description: string | null;
  discounts: [];
  ended_at: number | null;
  invoice_settings: {
    account_tax_ids: null;
    custom_fields: null;
    description: null;
    footer: null;
    issuer: { type: 'self' };
  };
  items: FakeList<FakeSubscriptionItem>;
  latest_invoice: string | null;
  livemode: false;
  metadata: Metadata;
  next_pending_invoice_item_invoice: null;
  on_behalf_of: null;
  pause_collection: null;
  payment_settings: null;
  pending_invoice_item_interval: null;
  pending_setup_intent: null;
  pending_update: null;
  schedule: null;
  start_date: number;
  status: SubscriptionStatus;
  test_clock: null;
  transfer_data: null;
  trial_end: number | null;
  trial_settings: { end_behavior: { billing_cycle_anchor: null; missing_payment_method: 'create_invoice' } };
  trial_start: number | null;
}

export interface FakeInvoiceLine {
  id: string;
  object: 'line_item';
  amount: number;
  currency: string;
  description: string;
  discount_amounts: [];
  discountable: boolean;
  discounts: [];
  invoice: string;
  livemode: false;
  metadata: Metadata;
  parent: {
    type: 'subscription_item_details';
    invoice_item_details: null;
    subscription_item_details: {
      invoice_item: null;
      proration: false;
      proration_details: null;
      subscription: string;
      subscription_item: string;
    };
  };
  period: { start: number; end: number };
  pretax_credit_amounts: [];
  pricing: {
    type: 'price_details';
    price_details: { price: string; product: string };
    unit_amount_decimal: string;
  };
  quantity: number;
  subscription: string;
  subtotal: number;
  taxes: [];
}

export type InvoiceStatus = 'draft' | 'open' | 'paid' | 'void' | 'uncollectible';

export interface FakeInvoice {
  id: string;
  object: 'invoice';
  account_country: string;
  account_name: string;
  amount_due: number;
  amount_overpaid: number;
  amount_paid: number;
  amount_remaining: number;
  amount_shipping: number;
  attempt_count: number;
  attempted: boolean;
  auto_advance: boolean;
  automatic_tax: { disabled_reason: null; enabled: false; liability: null; provider: null; status: null };
  billing_reason: 'subscription_cycle' | 'subscription_create' | 'upcoming';
  collection_method: 'charge_automatically';
  created: number;
  currency: string;
  customer: string;
  customer_email: string | null;
  customer_name: string | null;
  default_payment_method: string | null;
  description: string | null;
  discounts: [];
  due_date: null;
  effective_at: number | null;
  ending_balance: number | null;
  hosted_invoice_url: string | null;
  invoice_pdf: string | null;
  last_finalization_error: null;
  lines: FakeList<FakeInvoiceLine>;
  livemode: false;
  metadata: Metadata;
  next_payment_attempt: number | null;
  number: string | null;
  parent: {
    type: 'subscription_details';
    quote_details: null;
    subscription_details: { metadata: Metadata; subscription: string };
  };
  period_end: number;
  period_start: number;
  starting_balance: number;
  status: InvoiceStatus;
  status_transitions: {
    finalized_at: number | null;
    marked_uncollectible_at: null;
    paid_at: number | null;
    voided_at: null;
  };
  subtotal: number;
  subtotal_excluding_tax: number;
  total: number;
  total_excluding_tax: number;
  webhooks_delivered_at: number | null;
}

export type WebhookEventType =
  | 'customer.subscription.created'
  | 'customer.subscription.updated'
  | 'customer.subscription.deleted'
  | 'invoice.paid'
  | 'invoice.payment_failed';

export type EventObject = FakeSubscription | FakeInvoice;

export interface FakeEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: EventObject; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: WebhookEventType;
}

type Conforms<Mine extends Theirs, Theirs> = Mine;
type Common<Mine, Theirs> = Pick<Theirs, keyof Mine & keyof Theirs>;

export type ShapeChecks =
  | Conforms<FakeCustomer, Common<FakeCustomer, Stripe.Customer>>
  | Conforms<FakePaymentMethod, Common<FakePaymentMethod, Stripe.PaymentMethod>>
  | Conforms<FakeCard, Common<FakeCard, Stripe.PaymentMethod.Card>>
  | Conforms<FakeProduct, Common<FakeProduct, Stripe.Product>>
  | Conforms<Omit<FakePrice, 'unit_amount_decimal'>, Common<Omit<FakePrice, 'unit_amount_decimal'>, Stripe.Price>>
  | Conforms<FakeMeter, Common<FakeMeter, Stripe.Billing.Meter>>
  | Conforms<FakeMeterEvent, Common<FakeMeterEvent, Stripe.Billing.MeterEvent>>
  | Conforms<FakeMeterEventSummary, Common<FakeMeterEventSummary, Stripe.Billing.MeterEventSummary>>
  | Conforms<Omit<FakeSubscriptionItem, 'price'>, Common<Omit<FakeSubscriptionItem, 'price'>, Stripe.SubscriptionItem>>
  | Conforms<Omit<FakeSubscription, 'items'>, Common<Omit<FakeSubscription, 'items'>, Stripe.Subscription>>
  | Conforms<Omit<FakeInvoiceLine, 'pricing'>, Common<Omit<FakeInvoiceLine, 'pricing'>, Stripe.InvoiceLineItem>>
  | Conforms<Omit<FakeInvoice, 'lines'>, Common<Omit<FakeInvoice, 'lines'>, Stripe.Invoice>>
  | Conforms<Omit<FakeEvent, 'data' | 'type'>, Common<Omit<FakeEvent, 'data' | 'type'>, Stripe.Event>>;
