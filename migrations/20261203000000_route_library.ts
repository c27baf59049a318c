import type { Knex } from 'knex';

/**
 * Each workspace's own named points (fixes) and airways, read by flight-plan routes. A fix name may
 * repeat across regions; an airway is an ordered list of fix names.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('fixes', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('name', 16).notNullable();
    t.string('region', 40).notNullable().defaultTo('');
    t.double('lat').notNullable();
    t.double('lon').notNullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.unique(['workspace_id', 'name', 'region'], { indexName: 'fixes_workspace_name_region_unique' });
  });
  await knex.schema.createTable('airways', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('name', 16).notNullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.unique(['workspace_id', 'name'], { indexName: 'airways_workspace_name_unique' });
  });
  await knex.schema.createTable('airway_fixes', (t) => {
    t.increments('id').primary();
    t.integer('airway_id').notNullable().references('id').inTable('airways').onDelete('CASCADE');
    t.integer('sequence').notNullable();
    t.string('fix_name', 16).notNullable();
    t.unique(['airway_id', 'sequence'], { indexName: 'airway_fixes_airway_sequence_unique' });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('airway_fixes');
  await knex.schema.dropTableIfExists('airways');
  await knex.schema.dropTableIfExists('fixes');
}
