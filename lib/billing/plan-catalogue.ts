/**
 * The plan catalogue as plain data: the one source both the app (through `plans.ts`) and the local
 * payment fake (which creates these products, prices and the meter at start-up when they are
 * missing) read. No imports and no logic, so the fake depends on nothing of the app.
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

/** The plan a new workspace's trial is on. */
export const DEFAULT_PLAN_ID: PlanId = 'crew';

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
