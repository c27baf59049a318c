import type { Knex } from 'knex';

/**
 * Usage is sent to the payment service in batches: one meter event carries the units of a batch of
 * ledger rows and is identified by the batch. A row joins exactly one batch, in the same transaction
 * that creates the batch, before anything is sent; so a replayed send can only repeat the batch's own
 * identifier, which the service counts once.
 *
 * Rows still unsent when this runs may already have reached the service one event per row (a crash
 * between the send and the mark). Each becomes a one-unit batch carrying the row's own key as its
 * identifier, so its resend is recognised as already counted.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('usage_batches', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('customer_id', 64).notNullable();
    t.string('identifier', 100).notNullable().unique();
    t.integer('quantity').notNullable();
    // The latest occurred_at of its rows; all of them lie in the same UTC minute.
    t.string('occurred_at', 32).notNullable();
    t.string('created_at', 32).notNullable();
    t.string('sent_at', 32).nullable();
    t.integer('send_attempts').notNullable().defaultTo(0);
    t.string('next_attempt_at', 32).nullable();
    t.string('last_error', 500).nullable();
    t.index(['sent_at', 'id']);
    t.index(['workspace_id', 'sent_at']);
  });
  await knex.schema.alterTable('usage_events', (t) => {
    // No foreign key: on SQLite adding one would rebuild the whole ledger table.
    t.integer('batch_id').nullable();
    t.index(['batch_id']);
  });

  const now = new Date().toISOString();
  await knex.raw(
    `INSERT INTO usage_batches (workspace_id, customer_id, identifier, quantity, occurred_at, created_at, send_attempts, next_attempt_at, last_error)
     SELECT u.workspace_id, b.customer_id, u.idempotency_key, u.quantity, u.occurred_at, ?, u.send_attempts, u.next_attempt_at, u.last_error
     FROM usage_events u JOIN workspace_billing b ON b.workspace_id = u.workspace_id
     WHERE u.sent_at IS NULL AND b.customer_id IS NOT NULL AND b.subscription_id IS NOT NULL
       AND b.metered_since IS NOT NULL AND u.occurred_at >= b.metered_since`,
    [now],
  );
  await knex.raw(
    `UPDATE usage_events SET batch_id = (SELECT ub.id FROM usage_batches ub WHERE ub.identifier = usage_events.idempotency_key)
     WHERE sent_at IS NULL AND EXISTS (SELECT 1 FROM usage_batches ub WHERE ub.identifier = usage_events.idempotency_key)`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('usage_events', (t) => {
    t.dropIndex(['batch_id']);
  });
  await knex.schema.alterTable('usage_events', (t) => {
    t.dropColumn('batch_id');
  });
  await knex.schema.dropTable('usage_batches');
}
