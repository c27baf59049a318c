/**
 * The columns of a pending flight row in the order imports bind them (db/imports.ts
 * insertPendingFlights). No `server-only` here: the scale bench writes the same rows.
 */
export const PENDING_FLIGHT_COLUMNS = [
  'workspace_id',
  'import_id',
  'date',
  'flight',
  'origin',
  'destination',
  'aircraft_type_id',
  'aircraft_code',
  'fleet_id',
  'cruise_fl',
  'max_fl',
  'input_json',
  'status',
  'fuel_kg',
  'source_line',
  'created_at',
  'fuel_warning',
] as const;
