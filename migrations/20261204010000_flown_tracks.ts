import type { Knex } from 'knex';

/**
 * Flown tracks: an imported flight is either planned (a schedule row) or flown (a track file), so one
 * flight key (date, flight, origin, destination) may have one of each in a workspace. The unique key
 * gains the basis; existing flights are planned.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('flights', (t) => {
    t.string('basis', 8).notNullable().defaultTo('planned');
  });
  await knex.schema.alterTable('flights', (t) => {
    t.dropUnique(['workspace_id', 'date', 'flight', 'origin', 'destination']);
  });
  await knex.schema.alterTable('flights', (t) => {
    t.unique(['workspace_id', 'basis', 'date', 'flight', 'origin', 'destination'], {
      indexName: 'flights_workspace_basis_key_unique',
    });
    t.index(['workspace_id', 'date', 'flight'], 'flights_workspace_date_flight_index');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex('flights').where('basis', 'flown').delete();
  await knex.schema.alterTable('flights', (t) => {
    t.dropIndex(['workspace_id', 'date', 'flight'], 'flights_workspace_date_flight_index');
    t.dropUnique(
      ['workspace_id', 'basis', 'date', 'flight', 'origin', 'destination'],
      'flights_workspace_basis_key_unique',
    );
  });
  await knex.schema.alterTable('flights', (t) => {
    t.unique(['workspace_id', 'date', 'flight', 'origin', 'destination']);
  });
  await knex.schema.alterTable('flights', (t) => {
    t.dropColumn('basis');
  });
}
