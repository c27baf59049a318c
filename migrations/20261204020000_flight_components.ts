import type { Knex } from 'knex';

/**
 * Per-flight components of the fleet uncertainty sampling (lib/screening/fleet-uncertainty.ts
 * encodeFlightComponents: 668 bytes a flight), written with the flight's figures in the same
 * transaction; `engine_version` says which engine made them. And the stored fleet percentiles, keyed
 * by a digest of the fleet's flight set (ids and engine versions), the samples, the seed and the
 * engine version, so a page asks the sampler once per flight set.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('flight_components', (t) => {
    t.integer('flight_id').primary().references('id').inTable('flights').onDelete('CASCADE');
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('engine_version', 32).notNullable();
    t.binary('data').notNullable();
    t.index(['workspace_id']);
  });
  await knex.schema.createTable('fleet_percentiles', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('cache_key', 64).notNullable();
    t.text('result_json').notNullable();
    t.string('created_at', 32).notNullable();
    t.unique(['workspace_id', 'cache_key']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('fleet_percentiles');
  await knex.schema.dropTableIfExists('flight_components');
}
