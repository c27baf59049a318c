import type { UnitSystem } from '@/db/users';
import type { CompareRow, FleetContextRow, FleetPercentiles, FleetSeries } from '@/lib/fleets/types';
import type { CsvCell } from '@/lib/csv/write';
import { toCsv } from '@/lib/csv/write';

/** What a stored report holds besides its PDF and CSV (`reports.summary_json`). SI units. */
export interface ReportSummary {
  version: 1;
  title: string;
  workspaceName: string;
  period: { from: string; to: string; days: number };
  fleets: { id: number; name: string }[];
  generatedAt: string;
  generatedBy: string;
  /** The unit preference the PDF was drawn in. */
  units: UnitSystem;
  engineVersions: string[];
  /** Flights per engine version (reports stored before this field have only `engineVersions`). */
  engineVersionFlights?: { engineVersion: string; flights: number }[];
  totals: CompareRow;
  perFleet: CompareRow[];
  perFleetMonth: CompareRow[];
  months: string[];
  series: FleetSeries[];
  context: { fleets: FleetContextRow[]; total: FleetContextRow; method: string };
  notes: { co2: string; ratios: string; ozone: string; levelBand: string };
  cautions: string[];
  /**
   * 5-95 % of each fleet's totals and of all together from correlated sampling (absent in reports
   * built before it was kept; null when no flight could be sampled).
   */
  percentiles?: FleetPercentiles | null;
  /** Flights whose fuel was unusual for their distance (absent in reports built before it was kept). */
  fuelWarnings?: {
    count: number;
    items: { date: string; flight: string; origin: string; destination: string; warning: string }[];
  };
}

export const CSV_HEADER = [
  'fleet',
  'month',
  'flights',
  'distance_km',
  'fuel_kg',
  'co2_kg',
  'nox_kg',
  'nox_above_tropopause_kg',
  'share_above',
  'nox_above_per_1000_km_kg',
  'ozone_loss_central_kg',
  'ozone_loss_low_kg',
  'ozone_loss_high_kg',
  'nox_above_tropopause_p5_kg',
  'nox_above_tropopause_p95_kg',
  'ozone_loss_p5_kg',
  'ozone_loss_p95_kg',
] as const;

function csvRow(r: CompareRow, month: string, band?: FleetPercentiles['total']): CsvCell[] {
  return [
    r.fleetName,
    month,
    r.flights,
    r.distanceKm,
    r.fuelKg,
    r.co2Kg,
    r.noxTotalKg,
    r.noxAboveKg,
    r.shareAbove,
    r.noxAbovePer1000KmKg,
    r.ozone.centralKg,
    r.ozone.lowKg,
    r.ozone.highKg,
    band ? band.noxAboveTropopauseKg.p5 : null,
    band ? band.noxAboveTropopauseKg.p95 : null,
    band ? band.ozoneLossKg.p5 : null,
    band ? band.ozoneLossKg.p95 : null,
  ];
}

/**
 * The report's CSV: one row per fleet and month (months without flights are left out), each fleet's
 * total (month "total"), then the grand total. SI units, named in the header. The p5/p95 columns
 * (sampled 5-95 % of the totals) are filled on the total rows only.
 */
export function reportCsv(
  s: Pick<ReportSummary, 'perFleet' | 'perFleetMonth' | 'totals'> & Pick<Partial<ReportSummary>, 'percentiles'>,
): string {
  const rows: CsvCell[][] = [];
  const bandOf = (id: number | null) => s.percentiles?.fleets.find((b) => b.fleetId === id);
  for (const f of s.perFleet) {
    for (const m of s.perFleetMonth.filter((x) => x.fleetId === f.fleetId)) rows.push(csvRow(m, m.month ?? ''));
    rows.push(csvRow(f, 'total', bandOf(f.fleetId)));
  }
  rows.push(csvRow(s.totals, 'total', s.percentiles?.total));
  return toCsv(CSV_HEADER, rows);
}
