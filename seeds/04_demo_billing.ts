import type { Knex } from 'knex';
import type { PlanId } from '../lib/billing/plans';

/**
 * Billing state of the demo workspaces: each is subscribed (status active). The payment service's
 * customer and subscription do not exist yet when the seed runs; the app creates them when it starts
 * (lib/billing/provision.ts) and fills in their ids. Idempotent: a row that already has a customer is
 * left alone.
 */
const DEMO_BILLING: { slug: string; planId: PlanId; billingEmail: string | null }[] = [
  { slug: 'skarn-polar', planId: 'fleet', billingEmail: 'billing@tropopass.test' },
  { slug: 'velloway-jets', planId: 'crew', billingEmail: null },
  { slug: 'kestrel-mach', planId: 'crew', billingEmail: null },
];

const STAMP = '2026-01-01T00:00:00.000Z';

export async function seed(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    for (const d of DEMO_BILLING) {
      const w = await trx('workspaces').where({ slug: d.slug }).first('id');
      if (!w) continue;
      const existing = await trx('workspace_billing').where({ workspace_id: w.id }).first();
      const values = {
        plan_id: d.planId,
        status: 'active',
        trial_ends_at: null,
        billing_email: d.billingEmail,
        cancel_at_period_end: false,
        updated_at: STAMP,
      };
      if (!existing) await trx('workspace_billing').insert({ workspace_id: w.id, ...values });
      else if (!existing.customer_id) await trx('workspace_billing').where({ workspace_id: w.id }).update(values);
    }
  });
}
