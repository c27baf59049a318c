import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  const ws = (t: Knex.CreateTableBuilder) =>
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');

  await knex.schema.createTable('engines', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('name', 120).notNullable();
    // ICAO LTO modes in the order idle, approach, climb-out, take-off.
    t.double('ff_idle_kg_s').notNullable();
    t.double('ff_approach_kg_s').notNullable();
    t.double('ff_climb_out_kg_s').notNullable();
    t.double('ff_take_off_kg_s').notNullable();
    t.double('ei_idle_g_kg').notNullable();
    t.double('ei_approach_g_kg').notNullable();
    t.double('ei_climb_out_g_kg').notNullable();
    t.double('ei_take_off_g_kg').notNullable();
    t.string('source', 500).notNullable().defaultTo('');
    t.boolean('is_demo').notNullable().defaultTo(false);
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.unique(['workspace_id', 'name']);
  });

  await knex.schema.createTable('fleets', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('name', 80).notNullable();
    t.string('description', 500).notNullable().defaultTo('');
    t.string('created_at', 32).notNullable();
    t.unique(['workspace_id', 'name']);
  });

  await knex.schema.createTable('aircraft_types', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('code', 16).notNullable();
    t.string('name', 120).notNullable().defaultTo('');
    t.integer('engine_id').nullable().references('id').inTable('engines').onDelete('RESTRICT');
    t.integer('engine_count').notNullable().defaultTo(2);
    t.double('typical_mach').notNullable().defaultTo(0.8);
    t.integer('typical_flight_level').notNullable().defaultTo(350);
    t.double('direct_ei_g_kg').nullable();
    t.integer('default_fleet_id').nullable().references('id').inTable('fleets').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.unique(['workspace_id', 'code']);
  });

  await knex.schema.createTable('routes', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('name', 120).notNullable();
    t.text('waypoints_json').notNullable();
    t.string('notes', 2000).notNullable().defaultTo('');
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.unique(['workspace_id', 'name']);
  });

  await knex.schema.createTable('soundings', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('name', 120).notNullable();
    t.string('station', 120).notNullable().defaultTo('');
    t.string('observed_at', 32).nullable();
    t.text('levels_json').notNullable();
    t.double('tropopause_altitude_m').nullable();
    t.double('tropopause_pressure_hpa').nullable();
    t.double('tropopause_temperature_k').nullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
  });

  await knex.schema.createTable('screenings', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('name', 160).notNullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.integer('api_key_id').nullable().references('id').inTable('api_keys').onDelete('SET NULL');
    t.string('idempotency_key', 255).nullable();
    t.text('input_json').notNullable();
    t.text('result_json').notNullable();
    t.string('engine_version', 32).notNullable();
    t.string('route_label', 300).notNullable().defaultTo('');
    t.string('aircraft_code', 16).nullable();
    t.integer('flight_level').nullable();
    t.string('flight_date', 10).nullable();
    t.double('distance_km').notNullable();
    t.double('fuel_kg').notNullable();
    t.double('nox_total_kg').notNullable();
    t.double('nox_above_kg').notNullable();
    t.double('fraction_above').notNullable();
    t.double('ozone_central_kg').notNullable();
    t.double('ozone_low_kg').notNullable();
    t.double('ozone_high_kg').notNullable();
    t.string('created_at', 32).notNullable();
    t.unique(['workspace_id', 'idempotency_key']);
    t.index(['workspace_id', 'created_at']);
  });

  await knex.schema.createTable('imports', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('kind', 16).notNullable().defaultTo('schedule');
    t.string('file_name', 255).notNullable();
    t.string('file_hash', 64).notNullable();
    t.string('status', 16).notNullable();
    t.integer('rows').notNullable();
    t.integer('rows_done').notNullable().defaultTo(0);
    t.string('failure_reason', 1000).nullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('started_at', 32).nullable();
    t.string('finished_at', 32).nullable();
    t.string('heartbeat_at', 32).nullable();
    t.unique(['workspace_id', 'file_hash']);
  });

  await knex.schema.createTable('import_problems', (t) => {
    t.increments('id').primary();
    t.integer('import_id').notNullable().references('id').inTable('imports').onDelete('CASCADE');
    t.integer('line').notNullable();
    t.string('column', 64).notNullable().defaultTo('');
    t.string('message', 1000).notNullable();
  });

  await knex.schema.createTable('flights', (t) => {
    t.increments('id').primary();
    ws(t);
    t.integer('import_id').nullable().references('id').inTable('imports').onDelete('CASCADE');
    t.string('date', 10).notNullable();
    t.string('flight', 16).notNullable();
    t.string('origin', 4).notNullable();
    t.string('destination', 4).notNullable();
    t.integer('aircraft_type_id').nullable().references('id').inTable('aircraft_types').onDelete('SET NULL');
    t.string('aircraft_code', 16).notNullable();
    t.integer('fleet_id').nullable().references('id').inTable('fleets').onDelete('SET NULL');
    t.integer('cruise_fl').notNullable();
    t.integer('max_fl').notNullable();
    t.text('input_json').notNullable();
    t.string('status', 16).notNullable().defaultTo('pending');
    t.string('failure_reason', 500).nullable();
    t.double('distance_km').nullable();
    t.double('fuel_kg').notNullable();
    t.double('nox_total_kg').nullable();
    t.double('nox_above_kg').nullable();
    t.double('fraction_above').nullable();
    t.double('mean_depth_above_km').nullable();
    t.double('ozone_central_kg').nullable();
    t.double('ozone_low_kg').nullable();
    t.double('ozone_high_kg').nullable();
    t.string('engine_version', 32).nullable();
    t.string('screened_at', 32).nullable();
    t.string('created_at', 32).notNullable();
    t.unique(['workspace_id', 'date', 'flight', 'origin', 'destination']);
    t.index(['workspace_id', 'date']);
    t.index(['import_id', 'status']);
  });

  // The usage ledger: one row per billable unit, written in the same transaction as the work.
  await knex.schema.createTable('usage_events', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('kind', 24).notNullable();
    t.integer('source_id').notNullable();
    t.string('idempotency_key', 255).notNullable().unique();
    t.integer('quantity').notNullable().defaultTo(1);
    t.string('occurred_at', 32).notNullable();
    t.string('sent_at', 32).nullable();
    t.integer('send_attempts').notNullable().defaultTo(0);
    t.string('next_attempt_at', 32).nullable();
    t.string('last_error', 500).nullable();
    t.unique(['kind', 'source_id']);
    t.index(['workspace_id', 'occurred_at']);
    t.index(['sent_at']);
  });

  await knex.schema.createTable('workspace_billing', (t) => {
    t.integer('workspace_id').primary().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('plan_id', 32).notNullable();
    t.string('status', 16).notNullable();
    t.string('trial_ends_at', 32).nullable();
    t.string('customer_id', 64).nullable();
    t.string('subscription_id', 64).nullable();
    t.string('current_period_start', 32).nullable();
    t.string('current_period_end', 32).nullable();
    t.boolean('cancel_at_period_end').notNullable().defaultTo(false);
    t.string('billing_email', 254).nullable();
    t.string('payment_method_label', 64).nullable();
    t.string('updated_at', 32).notNullable();
  });

  await knex.schema.createTable('webhook_events', (t) => {
    t.string('id', 128).primary();
    t.string('type', 64).notNullable();
    t.string('received_at', 32).notNullable();
  });

  await knex.schema.createTable('reports', (t) => {
    t.increments('id').primary();
    ws(t);
    t.string('name', 160).notNullable();
    t.string('period_from', 10).notNullable();
    t.string('period_to', 10).notNullable();
    t.text('fleet_ids_json').notNullable();
    t.text('summary_json').notNullable();
    t.binary('pdf').notNullable();
    t.text('csv').notNullable();
    t.integer('created_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
  });

  await knex.schema.createTable('report_sends', (t) => {
    t.increments('id').primary();
    t.integer('report_id').notNullable().references('id').inTable('reports').onDelete('CASCADE');
    t.text('recipients').notNullable();
    t.integer('sent_by').nullable().references('id').inTable('users').onDelete('SET NULL');
    t.string('status', 16).notNullable();
    t.string('message_id', 255).nullable();
    t.string('error', 500).nullable();
    t.string('sent_at', 32).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    'report_sends',
    'reports',
    'webhook_events',
    'workspace_billing',
    'usage_events',
    'flights',
    'import_problems',
    'imports',
    'screenings',
    'soundings',
    'routes',
    'aircraft_types',
    'fleets',
    'engines',
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
