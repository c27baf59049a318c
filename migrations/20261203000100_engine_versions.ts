import type { Knex } from 'knex';

/**
 * Stored results and their engine version: a screening made again with a newer engine points at the
 * one it replaces (one re-screen per source and engine version), and an import carries the progress
 * of a background re-screen of its flights.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('screenings', (t) => {
    t.integer('rescreen_of').nullable().references('id').inTable('screenings').onDelete('SET NULL');
  });
  await knex.schema.alterTable('screenings', (t) => {
    t.unique(['rescreen_of', 'engine_version']);
  });
  await knex.schema.alterTable('imports', (t) => {
    t.string('rescreen_status', 16).nullable();
    t.string('rescreen_engine_version', 32).nullable();
    t.integer('rescreen_rows').nullable();
    t.integer('rescreen_rows_done').notNullable().defaultTo(0);
    t.integer('rescreen_rows_failed').notNullable().defaultTo(0);
    t.integer('rescreen_last_flight_id').notNullable().defaultTo(0);
    t.integer('rescreen_requested_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('rescreen_requested_at', 32).nullable();
    t.string('rescreen_finished_at', 32).nullable();
  });
  await knex.schema.alterTable('flights', (t) => {
    t.index(['import_id', 'engine_version']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('flights', (t) => {
    t.dropIndex(['import_id', 'engine_version']);
  });
  await knex.schema.alterTable('imports', (t) => {
    for (const c of [
      'rescreen_status',
      'rescreen_engine_version',
      'rescreen_rows',
      'rescreen_rows_done',
      'rescreen_rows_failed',
      'rescreen_last_flight_id',
      'rescreen_requested_by',
      'rescreen_requested_at',
      'rescreen_finished_at',
    ])
      t.dropColumn(c);
  });
  await knex.schema.alterTable('screenings', (t) => {
    t.dropUnique(['rescreen_of', 'engine_version']);
  });
  await knex.schema.alterTable('screenings', (t) => {
    t.dropColumn('rescreen_of');
  });
}
