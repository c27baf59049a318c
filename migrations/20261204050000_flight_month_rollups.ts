import type { Knex } from 'knex';

/**
 * Fleets of a million flights. `flight_month_rollups` holds the sums of a workspace's screened flights
 * per month and per everything the fleet comparison groups or filters by (the flight's own fleet, its
 * aircraft type, code, cruise and highest level, engine version, planned or flown basis), so the comparison, the overview and
 * the fleet list read a few thousand rows instead of every flight. It is written in the same
 * transaction as the flights it sums (db/flight-rollups.ts). A missing fleet or type is 0, an
 * unscreened engine version '', so the key can be unique on both databases.
 *
 * Indexes: (workspace_id, status, date) for the counts by status and the raw sums of part-months;
 * (workspace_id, date, id) for the flights list's keyset pages on PostgreSQL (SQLite's index on
 * (workspace_id, date) already ends with the rowid); the flights with a fuel warning, by date.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('flight_month_rollups', (t) => {
    t.increments('id').primary();
    t.integer('workspace_id').notNullable().references('id').inTable('workspaces').onDelete('CASCADE');
    t.string('month', 7).notNullable();
    t.integer('fleet_id').notNullable().defaultTo(0);
    t.integer('aircraft_type_id').notNullable().defaultTo(0);
    t.string('aircraft_code', 16).notNullable();
    t.integer('cruise_fl').notNullable();
    t.integer('max_fl').notNullable();
    t.string('engine_version', 32).notNullable().defaultTo('');
    // planned (a schedule flight) or flown (an imported track): the two are never summed together.
    t.string('basis', 8).notNullable().defaultTo('planned');
    t.integer('flights').notNullable().defaultTo(0);
    t.integer('fuel_warnings').notNullable().defaultTo(0);
    for (const c of [
      'distance_km',
      'fuel_kg',
      'nox_total_kg',
      'nox_above_kg',
      'ozone_central_kg',
      'ozone_low_kg',
      'ozone_high_kg',
    ])
      t.double(c).notNullable().defaultTo(0);
    t.unique(
      [
        'workspace_id',
        'month',
        'fleet_id',
        'aircraft_type_id',
        'aircraft_code',
        'cruise_fl',
        'max_fl',
        'engine_version',
        'basis',
      ],
      { indexName: 'flight_month_rollups_key' },
    );
  });
  await knex.schema.alterTable('flights', (t) => {
    t.index(['workspace_id', 'status', 'date'], 'flights_workspace_status_date_index');
    t.index(['workspace_id', 'date', 'id'], 'flights_workspace_date_id_index');
    t.index(['workspace_id', 'date'], 'flights_fuel_warning_date_index', {
      predicate: knex.whereNotNull('fuel_warning'),
    });
  });
  await knex.raw(
    `INSERT INTO flight_month_rollups (workspace_id, month, fleet_id, aircraft_type_id, aircraft_code, cruise_fl, max_fl, engine_version, basis, flights, fuel_warnings, distance_km, fuel_kg, nox_total_kg, nox_above_kg, ozone_central_kg, ozone_low_kg, ozone_high_kg)
     SELECT workspace_id, substr(date, 1, 7), coalesce(fleet_id, 0), coalesce(aircraft_type_id, 0), aircraft_code, cruise_fl, max_fl, coalesce(engine_version, ''), basis,
       count(*), sum(CASE WHEN fuel_warning IS NULL THEN 0 ELSE 1 END), sum(coalesce(distance_km, 0)), sum(fuel_kg), sum(coalesce(nox_total_kg, 0)), sum(coalesce(nox_above_kg, 0)),
       sum(coalesce(ozone_central_kg, 0)), sum(coalesce(ozone_low_kg, 0)), sum(coalesce(ozone_high_kg, 0))
     FROM flights WHERE status = 'screened'
     GROUP BY workspace_id, substr(date, 1, 7), coalesce(fleet_id, 0), coalesce(aircraft_type_id, 0), aircraft_code, cruise_fl, max_fl, coalesce(engine_version, ''), basis`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('flights', (t) => {
    t.dropIndex(['workspace_id', 'date'], 'flights_fuel_warning_date_index');
    t.dropIndex(['workspace_id', 'date', 'id'], 'flights_workspace_date_id_index');
    t.dropIndex(['workspace_id', 'status', 'date'], 'flights_workspace_status_date_index');
  });
  await knex.schema.dropTableIfExists('flight_month_rollups');
}
