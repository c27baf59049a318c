import type { Knex } from 'knex';

/**
 * One row per signed-in session. The session's id travels in the signed token; sign-out marks the row
 * revoked, so a copied cookie stops working at once instead of at the end of its lifetime.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('auth_sessions', (t) => {
    t.string('id', 64).primary();
    t.integer('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.string('created_at', 32).notNullable();
    t.string('expires_at', 32).notNullable();
    t.string('revoked_at', 32).nullable();
    t.index(['user_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('auth_sessions');
}
