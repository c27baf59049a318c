import type { Knex } from 'knex';

/**
 * Report e-mails are jobs. A send is recorded as `queued` in the request, with a per-send key that the
 * job uses as the e-mail's Message-ID; `attempts` counts the mail server attempts, recorded before each
 * one; `queued_at` is when it was asked for (`sent_at` stays the time of its latest outcome).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('report_sends', (t) => {
    t.string('send_key', 64).nullable();
    t.integer('attempts').notNullable().defaultTo(0);
    t.string('queued_at', 32).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('report_sends', (t) => {
    t.dropColumn('queued_at');
    t.dropColumn('attempts');
    t.dropColumn('send_key');
  });
}
