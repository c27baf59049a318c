import type { Knex } from 'knex';

/**
 * A monthly usage budget per workspace (integer cents of per-flight charges in a billing period),
 * whether reaching it stops new billable work, and the period of the last 80 % and 100 % alert sent,
 * so each alert goes once per threshold per period.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workspace_billing', (t) => {
    t.integer('usage_budget_cents').nullable();
    t.boolean('budget_hard_stop').notNullable().defaultTo(false);
    t.string('budget_alert_80_period', 32).nullable();
    t.string('budget_alert_100_period', 32).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workspace_billing', (t) => {
    t.dropColumn('usage_budget_cents');
    t.dropColumn('budget_hard_stop');
    t.dropColumn('budget_alert_80_period');
    t.dropColumn('budget_alert_100_period');
  });
}
