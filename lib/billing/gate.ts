import 'server-only';
import type { Knex } from 'knex';
import { db } from '@/db/client';
import { paymentRequired } from '@/lib/errors';
import { assertWithinBudget } from './budget';

/**
 * Refuses new billable work (screenings, imports) while the workspace's subscription is past due,
 * canceled, or its trial has ended without a subscription, or when `addingUnits` more would pass a
 * usage budget with the hard stop on. Reading stays open.
 */
export async function assertBillingAllows(
  scope: { workspaceId: number },
  trx: Knex | Knex.Transaction = db(),
  addingUnits = 1,
): Promise<void> {
  const b = await trx('workspace_billing').where({ workspace_id: scope.workspaceId }).first();
  if (!b) return;
  if (b.status === 'past_due') {
    throw paymentRequired(
      'The last payment for this workspace failed. A finance admin or owner can update the card under Settings → Billing; screening resumes once it is paid.',
    );
  }
  if (b.status === 'canceled') {
    throw paymentRequired(
      'This workspace has no active subscription. An owner or finance admin can subscribe under Settings → Billing.',
    );
  }
  if (b.status === 'trialing' && b.trial_ends_at && b.trial_ends_at < new Date().toISOString() && !b.subscription_id) {
    throw paymentRequired(
      'The free trial of this workspace has ended. Subscribe under Settings → Billing to keep screening.',
    );
  }
  await assertWithinBudget(scope, trx, addingUnits);
}
