import type { GroupBy } from '@/lib/validation/fleets';

/** One row of the fleet comparison. Masses in kg (NOx as NO2), distances in km; ratios from sums. */
export interface CompareRow {
  /** Stable key: fleet id (or "none"), plus month or aircraft when grouped. */
  key: string;
  fleetId: number | null;
  fleetName: string;
  month: string | null;
  aircraftCode: string | null;
  flights: number;
  distanceKm: number;
  fuelKg: number;
  co2Kg: number;
  noxTotalKg: number;
  noxAboveKg: number;
  /** NOx above the tropopause / NOx total, from the sums; null when there is no NOx. */
  shareAbove: number | null;
  /** NOx above the tropopause per 1000 km flown, kg; null when there is no distance. */
  noxAbovePer1000KmKg: number | null;
  ozone: { centralKg: number; lowKg: number; highKg: number };
}

export interface FleetSeries {
  fleetId: number | null;
  fleetName: string;
  /** Per month of `months`: NOx above the tropopause, kg. */
  noxAboveKg: number[];
  /** Per month of `months`: share above, null for a month without NOx. */
  shareAbove: (number | null)[];
}

export interface FleetContextRow {
  fleetId: number | null;
  fleetName: string;
  /** NOx above the tropopause scaled from the period to a year, kg per year. */
  annualNoxAboveKg: number;
  studies: {
    study: string;
    citation: string;
    altitudeKm: readonly [number, number];
    applicable: boolean;
    noxInBandKgPerYear: number;
    /** Global column ozone change, % (negative is a loss): central and the +/-50 % band. */
    columnChangePct: { central: number; low: number; high: number } | null;
    note: string;
  }[];
}

export interface FleetComparison {
  period: { from: string; to: string; days: number };
  groupBy: GroupBy;
  filters: {
    aircraft: string | null;
    route: string | null;
    minFl: number | null;
    maxFl: number | null;
    fleets: number[] | null;
    /** planned, flown or flown-where-available: which flights were summed. */
    basis: 'planned' | 'flown' | 'flown-where-available';
  };
  rows: CompareRow[];
  totals: CompareRow;
  months: string[];
  series: FleetSeries[];
  context: { fleets: FleetContextRow[]; total: FleetContextRow; method: string };
  notes: { co2: string; ratios: string; ozone: string; levelBand: string };
  cautions: string[];
  /** The engine versions that made the figures compared, with how many flights each. */
  engineVersions: { engineVersion: string; flights: number }[];
  /** True when the figures come from more than one engine version (a caution says so). */
  mixedEngineVersions: boolean;
  /**
   * 5-95 % of each fleet's totals and of all together from correlated sampling; `{ pending }` while
   * the worker still builds the flights' components; null without flights.
   */
  percentiles: FleetPercentiles | FleetPercentilesPending | null;
}

/** 5th, 50th and 95th percentile of a sampled total. */
export interface PercentileBand {
  p5: number;
  p50: number;
  p95: number;
}

/** Sampled percentiles of one fleet's totals (or of all fleets together, `fleetId` null). Masses in kg. */
export interface FleetPercentileRow {
  fleetId: number | null;
  /** Screened flights of the fleet in the selection. */
  flights: number;
  /** Of those, the flights in the sampling (a flight screened by an older engine version is left out). */
  flightsSampled: number;
  noxAboveTropopauseKg: PercentileBand;
  fractionAboveTropopause: PercentileBand;
  ozoneLossKg: PercentileBand;
}

/** Fleet percentiles: per fleet and in total, with how the sampling correlates the inputs. */
export interface FleetPercentiles {
  samples: number;
  seed: number;
  engineVersion: string;
  fleets: FleetPercentileRow[];
  total: FleetPercentileRow;
  flightsLeftOut: number;
  /** How the sampling correlates the inputs across flights (the engine's text). */
  correlation: string;
  /** What the percentiles mean and what they leave out, in plain words. */
  note: string;
}

/** Fleet percentiles not ready: the worker is still building components for `flightsPending` flights. */
export interface FleetPercentilesPending {
  pending: true;
  flightsPending: number;
  flights: number;
}
