import type { Knex } from 'knex';

/**
 * Reporting periods: a calendar month, quarter or year (a row made on first use) or a custom range an
 * owner defines, with its state (open, review, signed). Moving a period to review freezes it: its
 * screened flights and their figures are copied into `period_flights`, and the report PDF, the audit
 * CSV and its SHA-256 into `period_snapshots`, so later imports or re-screenings change nothing frozen.
 * Targets per period and fleet (fleet_key 0: the whole workspace) remember which alert thresholds were
 * already e-mailed, so each goes once.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('reporting_periods', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('kind', 8).notNullable();
    t.string('key', 24).notNullable();
    t.string('name', 120).notNullable();
    t.string('date_from', 10).notNullable();
    t.string('date_to', 10).notNullable();
    t.string('state', 8).notNullable().defaultTo('open');
    t.string('frozen_at', 32).nullable();
    t.string('frozen_by_name', 200).nullable();
    t.string('signed_at', 32).nullable();
    t.integer('signed_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('signed_by_name', 200).nullable();
    t.string('sign_hash', 64).nullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.unique(['workspace_id', 'key']);
  });

  await knex.schema.createTable('period_snapshots', (t) => {
    t.integer('period_id').primary().references('id').inTable('reporting_periods').onDelete('CASCADE');
    t.string('frozen_at', 32).notNullable();
    t.integer('flights').notNullable();
    t.text('engine_versions_json').notNullable();
    t.text('assumptions_json').notNullable();
    t.text('summary_json').notNullable();
    t.text('targets_json').notNullable();
    t.binary('pdf').notNullable();
    t.text('csv').notNullable();
    t.string('csv_sha256', 64).notNullable();
  });

  await knex.schema.createTable('period_flights', (t) => {
    t.increments('id').primary();
    t.integer('period_id').notNullable().references('id').inTable('reporting_periods').onDelete('CASCADE');
    // No foreign key: the frozen copy outlives the flight (an import deleted after sign-off).
    t.integer('flight_id').notNullable();
    t.integer('import_id').nullable();
    t.string('date', 10).notNullable();
    t.string('flight', 16).notNullable();
    t.string('origin', 4).notNullable();
    t.string('destination', 4).notNullable();
    t.string('aircraft_code', 16).notNullable();
    t.integer('fleet_id').nullable();
    t.string('fleet_name', 80).nullable();
    t.integer('cruise_fl').notNullable();
    t.integer('max_fl').notNullable();
    t.double('fuel_kg').notNullable();
    t.double('distance_km').notNullable();
    t.double('nox_total_kg').notNullable();
    t.double('nox_above_kg').notNullable();
    t.double('ozone_central_kg').notNullable();
    t.double('ozone_low_kg').notNullable();
    t.double('ozone_high_kg').notNullable();
    t.string('engine_version', 32).notNullable();
    t.string('screened_at', 32).notNullable();
    t.index(['period_id', 'date']);
  });

  await knex.schema.createTable('period_targets', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.integer('period_id').notNullable().references('id').inTable('reporting_periods').onDelete('CASCADE');
    t.integer('fleet_id').nullable().references('id').inTable('fleets').onDelete('CASCADE');
    t.integer('fleet_key').notNullable().defaultTo(0);
    t.string('metric', 24).notNullable();
    t.double('value').notNullable();
    t.string('alert_90_at', 32).nullable();
    t.string('alert_100_at', 32).nullable();
    t.integer('updated_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('updated_at', 32).notNullable();
    t.unique(['period_id', 'fleet_key', 'metric']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['period_targets', 'period_flights', 'period_snapshots', 'reporting_periods']) {
    await knex.schema.dropTableIfExists(table);
  }
}
