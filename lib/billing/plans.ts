/**
 * The plan catalogue and the rules on it (lookup keys, charge estimates, money display). The data
 * itself lives in `plan-catalogue.ts`, which the local payment fake reads too.
 */

import { PLANS, PLAN_IDS, type Plan, type PlanId } from './plan-catalogue';

export {
  CURRENCY,
  BILLING_INTERVAL,
  TRIAL_DAYS,
  METER_EVENT_NAME,
  METER_DISPLAY_NAME,
  METER_CUSTOMER_PAYLOAD_KEY,
  METER_VALUE_PAYLOAD_KEY,
  METERED_PRODUCT,
  PLANS,
  PLAN_IDS,
  DEFAULT_PLAN_ID,
} from './plan-catalogue';
export type { Plan, PlanId } from './plan-catalogue';

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
