import type { Knex } from 'knex';

/**
 * The shared throttle counts (rate-limiter-flexible's PostgreSQL store: key, points, expire). Made
 * here rather than by the library at start: several limiters creating one table at once race inside
 * PostgreSQL and a losing request answered 500. The same columns the library would create; on
 * SQLite the table is unused.
 */
export async function up(knex: Knex): Promise<void> {
  if (await knex.schema.hasTable('throttle_counts')) return;
  await knex.schema.createTable('throttle_counts', (t) => {
    t.string('key', 255).primary();
    t.integer('points').notNullable().defaultTo(0);
    t.bigInteger('expire').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('throttle_counts');
}
