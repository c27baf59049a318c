import type { Knex } from 'knex';

/**
 * The fingerprint (SHA-256 of the canonical JSON body) of the request that first used a screening's
 * Idempotency-Key, so the same key sent with a different body can be refused.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('screenings', (t) => {
    t.string('idempotency_fingerprint', 64).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('screenings', (t) => {
    t.dropColumn('idempotency_fingerprint');
  });
}
