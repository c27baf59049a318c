/**
 * The plan catalogue, shared by the app and the local payment fake (which creates these products,
 * prices and the meter at start-up when they are missing). Pure data: no node, next or stripe imports.
 *
 * Money is in integer US cents. The metered unit is one screened flight.
 */

export type PlanId = 'crew' | 'fleet';

export interface Plan {
  id: PlanId;
  /** Name shown to customers. */
  name: string;
  description: string;
  /** Flat fee per monthly period, in US cents. */
  baseFeeCents: number;
  /** Price of one screened flight, in US cents. */
  perFlightCents: number;
  /** Product that carries the flat monthly fee. */
  productId: string;
  /** Lookup key of the licensed (flat monthly) price. */
  baseLookupKey: string;
  /** Lookup key of the metered (per screened flight) price. */
  meteredLookupKey: string;
}

export const CURRENCY = 'usd';
export const BILLING_INTERVAL = 'month';

/** Every new workspace starts with this many free days. */
export const TRIAL_DAYS = 14;

/** `event_name` of the meter and of every meter event the app sends. */
export const METER_EVENT_NAME = 'screened_flight';
export const METER_DISPLAY_NAME = 'Screened flights';
/** Payload keys the meter reads: the customer id and the number of units (whole flights). */
export const METER_CUSTOMER_PAYLOAD_KEY = 'stripe_customer_id';
export const METER_VALUE_PAYLOAD_KEY = 'value';

/** Product that carries the per-flight prices of every plan. */
export const METERED_PRODUCT = {
  id: 'tropopass_screened_flights',
  name: 'Screened flights',
  unitLabel: 'flight',
} as const;

export const PLANS: Readonly<Record<PlanId, Plan>> = {
  crew: {
    id: 'crew',
    name: 'Crew',
    description: 'For a small operator: a low monthly fee and a per-flight price.',
    baseFeeCents: 4_900,
    perFlightCents: 40,
    productId: 'tropopass_plan_crew',
    baseLookupKey: 'tropopass_crew_base_monthly',
    meteredLookupKey: 'tropopass_crew_flight_metered',
  },
  fleet: {
    id: 'fleet',
    name: 'Fleet',
    description: 'For a larger fleet: a higher monthly fee and a lower per-flight price.',
    baseFeeCents: 39_900,
    perFlightCents: 15,
    productId: 'tropopass_plan_fleet',
    baseLookupKey: 'tropopass_fleet_base_monthly',
    meteredLookupKey: 'tropopass_fleet_flight_metered',
  },
};

export const PLAN_IDS: readonly PlanId[] = ['crew', 'fleet'];

export const DEFAULT_PLAN_ID: PlanId = 'crew';

export function isPlanId(value: unknown): value is PlanId {
  return typeof value === 'string' && (PLAN_IDS as readonly string[]).includes(value);
}

export function getPlan(planId: PlanId): Plan {
  return PLANS[planId];
}

/** Both lookup keys of a plan, base first, as `prices.list({ lookup_keys })` wants them. */
export function planLookupKeys(planId: PlanId): [string, string] {
  const plan = PLANS[planId];
  return [plan.baseLookupKey, plan.meteredLookupKey];
}

export const ALL_LOOKUP_KEYS: readonly string[] = PLAN_IDS.flatMap((id) => planLookupKeys(id));

export type PriceKind = 'base' | 'metered';

/** Which plan and which of its two prices a lookup key names, or null for a key not in the catalogue. */
export function planForLookupKey(lookupKey: string): { plan: Plan; kind: PriceKind } | null {
  for (const id of PLAN_IDS) {
    const plan = PLANS[id];
    if (plan.baseLookupKey === lookupKey) return { plan, kind: 'base' };
    if (plan.meteredLookupKey === lookupKey) return { plan, kind: 'metered' };
  }
  return null;
}

/**
 * Charge for one full paid period, in US cents: the base fee plus `units` screened flights at the
 * plan's per-flight price. `units` must be a whole number of flights, 0 or more.
 */
export function estimateChargeCents(planId: PlanId, units: number): number {
  if (!Number.isInteger(units) || units < 0) {
    throw new RangeError(`units must be a whole number >= 0, got ${units}`);
  }
  const plan = PLANS[planId];
  return plan.baseFeeCents + units * plan.perFlightCents;
}

/**
 * Number of flights per period above which the larger plan costs less than the small one
 * (the smallest whole `units` where fleet < crew).
 */
export function breakEvenUnits(): number {
  const { crew, fleet } = PLANS;
  const perFlightSaving = crew.perFlightCents - fleet.perFlightCents;
  return Math.floor((fleet.baseFeeCents - crew.baseFeeCents) / perFlightSaving) + 1;
}

/** `12345` -> `"$123.45"`; negative amounts get a leading minus. */
export function formatUsd(cents: number): string {
  const sign = cents < 0 ? '-' : '';
  const abs = Math.abs(Math.round(cents));
  const dollars = Math.floor(abs / 100).toLocaleString('en-US');
  return `${sign}$${dollars}.${String(abs % 100).padStart(2, '0')}`;
}
