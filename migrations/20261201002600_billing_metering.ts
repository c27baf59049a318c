import type { Knex } from 'knex';

/**
 * Billing state the metering needs beyond the first schema: from when a workspace's usage is sent to
 * the payment service (units before it, such as free-trial usage, are never billed), the latest
 * ledger-versus-provider reconciliation, and when a payment last failed.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workspace_billing', (t) => {
    t.string('metered_since', 32).nullable();
    t.string('payment_failed_at', 32).nullable();
    t.string('recon_window_start', 32).nullable();
    t.string('recon_window_end', 32).nullable();
    t.integer('recon_ledger_units').nullable();
    t.integer('recon_provider_units').nullable();
    t.string('recon_checked_at', 32).nullable();
  });
  await knex.schema.alterTable('workspace_billing', (t) => {
    t.index(['customer_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workspace_billing', (t) => {
    t.dropIndex(['customer_id']);
  });
  await knex.schema.alterTable('workspace_billing', (t) => {
    t.dropColumn('metered_since');
    t.dropColumn('payment_failed_at');
    t.dropColumn('recon_window_start');
    t.dropColumn('recon_window_end');
    t.dropColumn('recon_ledger_units');
    t.dropColumn('recon_provider_units');
    t.dropColumn('recon_checked_at');
  });
}
