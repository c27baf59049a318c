import type { Knex } from 'knex';

/** An imported flight whose fuel is unusual for its distance keeps the warning its row got at import. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('flights', (t) => {
    t.string('fuel_warning', 500).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('flights', (t) => {
    t.dropColumn('fuel_warning');
  });
}
