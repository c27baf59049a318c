import type { Knex } from 'knex';

/**
 * Schedule imports: the CSV line each flight came from (so a flight that cannot be screened is
 * reported by line), and the point from which the worker measures its rate, reset when it resumes an
 * import after a restart so rows per second and time left stay honest.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('flights', (t) => {
    t.integer('source_line').nullable();
  });
  await knex.schema.alterTable('imports', (t) => {
    t.string('rate_since', 32).nullable();
    t.integer('rate_base_rows').notNullable().defaultTo(0);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('imports', (t) => {
    t.dropColumn('rate_base_rows');
    t.dropColumn('rate_since');
  });
  await knex.schema.alterTable('flights', (t) => {
    t.dropColumn('source_line');
  });
}
