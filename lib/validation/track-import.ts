/**
 * Flown-track imports (DESIGN.md "Import formats", Tracks): limits, the columns with their
 * documentation (the imports page and the template read the same list). Client-safe.
 */
export const TRACK_IMPORT_LIMITS = {
  /** 80 MB of CSV: a million points of ten flights' worth of columns is about 50 MB. */
  maxBytes: 80 * 1024 * 1024,
  /** Points (data rows) in one file. */
  maxPoints: 1_000_000,
  /** Flights in one file. */
  maxFlights: 5_000,
  /** A refusal lists at most this many problems (it says how many there were). */
  maxProblemsListed: 1000,
} as const;

export const TRACK_REQUIRED_COLUMNS = ['flight', 'date', 'time', 'lat', 'lon'] as const;
/** One of the two level columns is required. */
export const TRACK_LEVEL_COLUMNS = ['altitude_ft', 'flight_level'] as const;
export const TRACK_OPTIONAL_COLUMNS = ['fuel_flow_kg_h', 'aircraft', 'origin', 'destination'] as const;
export const TRACK_COLUMNS = [...TRACK_REQUIRED_COLUMNS, ...TRACK_LEVEL_COLUMNS, ...TRACK_OPTIONAL_COLUMNS] as const;
export type TrackColumn = (typeof TRACK_COLUMNS)[number];

export interface TrackColumnDoc {
  name: TrackColumn;
  required: 'yes' | 'one of two' | 'no';
  unit: string;
  description: string;
  example: string;
}

export const TRACK_COLUMN_DOCS: readonly TrackColumnDoc[] = [
  {
    name: 'flight',
    required: 'yes',
    unit: 'up to 16 characters',
    description: 'Flight number; with the date it says which flight a point belongs to.',
    example: 'SKP401',
  },
  {
    name: 'date',
    required: 'yes',
    unit: 'YYYY-MM-DD, UTC',
    description: 'Date of departure (the same on every point of a flight, also after midnight).',
    example: '2026-11-03',
  },
  {
    name: 'time',
    required: 'yes',
    unit: 'HH:MM:SS, UTC',
    description:
      'Time of the point. Points of a flight in time order; a time earlier than the one before is the next day.',
    example: '10:42:05',
  },
  { name: 'lat', required: 'yes', unit: 'degrees, -90 to 90', description: 'Latitude (WGS-84).', example: '61.2104' },
  {
    name: 'lon',
    required: 'yes',
    unit: 'degrees, -180 to 180',
    description: 'Longitude (WGS-84).',
    example: '-12.5031',
  },
  {
    name: 'altitude_ft',
    required: 'one of two',
    unit: 'ft, 0 to 66 000',
    description: 'Pressure altitude (on 1013.25 hPa), as surveillance and flight data give it.',
    example: '37000',
  },
  {
    name: 'flight_level',
    required: 'one of two',
    unit: '0 to 660',
    description: 'Flight level, instead of altitude_ft.',
    example: '370',
  },
  {
    name: 'fuel_flow_kg_h',
    required: 'no',
    unit: 'kg/h, whole aircraft',
    description:
      'Fuel flow at the point. On every point of a flight, it is integrated over time; without it the planned flight’s fuel is spread by time along the track.',
    example: '6850',
  },
  {
    name: 'aircraft',
    required: 'no',
    unit: 'aircraft type code',
    description: 'An aircraft type of the workspace; without it the planned flight’s type is used.',
    example: 'SK-LR1',
  },
  {
    name: 'origin',
    required: 'no',
    unit: 'ICAO or IATA code',
    description: 'Departure airport; without it the planned flight with this flight number and date gives it.',
    example: 'EFHK',
  },
  {
    name: 'destination',
    required: 'no',
    unit: 'ICAO or IATA code',
    description: 'Destination airport; as origin.',
    example: 'PANC',
  },
];
