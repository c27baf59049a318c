import { createHash } from 'node:crypto';
import type { AfterSignOffChange, FrozenFlight } from '@/db/periods';
import { toCsv, type CsvCell } from '@/lib/csv/write';
import { CO2_PER_KG_FUEL } from '@/lib/screening/screen-flight';

/** The page of one imported flight (its own page; the URL pattern is fixed). */
export function flightPageUrl(base: URL | string, slug: string, flightId: number): string {
  return new URL(`/w/${encodeURIComponent(slug)}/flights/${flightId}`, base).toString();
}

export const AUDIT_CSV_HEADER = [
  'period',
  'flight_id',
  'date',
  'flight',
  'origin',
  'destination',
  'aircraft',
  'fleet',
  'cruise_fl',
  'max_fl',
  'fuel_kg',
  'distance_km',
  'co2_kg',
  'nox_kg',
  'nox_above_tropopause_kg',
  'share_above',
  'nox_above_per_1000_km_kg',
  'ozone_loss_central_kg',
  'ozone_loss_low_kg',
  'ozone_loss_high_kg',
  'engine_version',
  'screened_at',
  'import_id',
  'flight_page_url',
] as const;

/**
 * Every frozen flight of a period, one row each: the schedule inputs, the figures, the engine
 * version that made them and the import they came from (SI units, named in the header). The
 * sign-off hash is the SHA-256 of exactly these bytes (UTF-8), so anyone can recompute it.
 */
export function auditCsv(periodKey: string, flights: FrozenFlight[], pageUrl: (flightId: number) => string): string {
  const rows: CsvCell[][] = flights.map((f) => [
    periodKey,
    f.flightId,
    f.date,
    f.flight,
    f.origin,
    f.destination,
    f.aircraftCode,
    f.fleetName,
    f.cruiseFl,
    f.maxFl,
    f.fuelKg,
    f.distanceKm,
    f.fuelKg * CO2_PER_KG_FUEL,
    f.noxTotalKg,
    f.noxAboveKg,
    f.noxTotalKg > 0 ? f.noxAboveKg / f.noxTotalKg : null,
    f.distanceKm > 0 ? (f.noxAboveKg / f.distanceKm) * 1000 : null,
    f.ozoneCentralKg,
    f.ozoneLowKg,
    f.ozoneHighKg,
    f.engineVersion,
    f.screenedAt,
    f.importId,
    pageUrl(f.flightId),
  ]);
  return toCsv(AUDIT_CSV_HEADER, rows);
}

export function sha256Hex(bytes: string | Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

export const CHANGES_CSV_HEADER = [
  'change',
  'flight_id',
  'date',
  'flight',
  'origin',
  'destination',
  'import_id',
  'engine_version',
  'at',
  'nox_above_tropopause_kg_now',
  'nox_above_tropopause_kg_frozen',
  'flight_page_url',
] as const;

/** Flights imported, screened again or removed after the period was frozen (not in its figures). */
export function changesCsv(changes: AfterSignOffChange[], pageUrl: (flightId: number) => string): string {
  return toCsv(
    CHANGES_CSV_HEADER,
    changes.map((c) => [
      c.kind,
      c.flightId,
      c.date,
      c.flight,
      c.origin,
      c.destination,
      c.importId,
      c.engineVersion,
      c.at,
      c.noxAboveKgNow,
      c.noxAboveKgFrozen,
      c.kind === 'removed' ? null : pageUrl(c.flightId),
    ]),
  );
}
