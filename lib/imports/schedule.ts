import { Readable } from 'node:stream';
import type { ReadableStream as NodeReadableStream } from 'node:stream/web';
import Papa from 'papaparse';
import {
  expandFlightPlanInput,
  findAirport,
  routeDistanceKm,
  ScreeningInputError,
  validateScreeningInput,
  type RouteLibrary,
  type ScreeningInput,
} from '@/lib/screening';
import { checkFuelPlausibility } from '@/lib/validation/plausibility';
import { tooLarge } from '@/lib/errors';
import {
  IMPORT_LIMITS,
  SCHEDULE_COLUMNS,
  SCHEDULE_REQUIRED_COLUMNS,
  scheduleRowSchema,
  type ImportProblem,
  type ScheduleCells,
  type ScheduleColumn,
  type ScheduleRow,
} from '@/lib/validation/imports';
import type { AircraftForScreening } from '@/db/aircraft-lookup';
import type { PendingFlightFields } from '@/db/imports';
import { NOT_UTF8_PROBLEM, readCsvHeader, type CsvHeader } from './csv';

/**
 * Reading a flight-schedule CSV (DESIGN.md "Import formats"): streamed through papaparse, every row
 * checked (its cells, the workspace's aircraft types and fleets, the airports, repeats inside the
 * file, and the screening input it makes, whose problems are reported by CSV column). Nothing here
 * touches the database: the caller passes what the workspace holds.
 */

export interface ScheduleContext {
  /** The workspace's aircraft types by upper-case code. */
  aircraft: Map<string, AircraftForScreening>;
  /** The workspace's fleets by lower-case name. */
  fleets: Map<string, { id: number; name: string }>;
  /** The workspace's named points and airways, for rows with a flight-plan route. */
  library?: RouteLibrary;
}

/** A row that passed every check, ready to be stored as a pending flight. */
export interface PreparedFlight extends PendingFlightFields {
  /** The validated cruise, Mach and emission; the rest of the screening input is in the fields above. */
  cruise: ScreeningInput['cruise'];
  mach: number | undefined;
  /** Shared by every row of an aircraft type: 100 000 rows must fit in the server's memory. */
  emission: ScreeningInput['emission'];
  /** The waypoints read from the row's flight-plan route, when it has one (else the great circle). */
  waypoints?: { lat: number; lon: number }[];
  /** Set when the fuel is unusual (not impossible) for the distance: kept with the flight. */
  fuelWarning?: string | null;
}

/**
 * The screening input of a prepared flight: its route (the great circle, or the waypoints its
 * flight-plan route was read into, so a later change to the fix library does not move it), cruise,
 * fuel, emission, Mach and date.
 */
export function screeningInputOf(f: PreparedFlight): ScreeningInput {
  return {
    route: { waypoints: f.waypoints ?? [{ airport: f.origin }, { airport: f.destination }] },
    cruise: f.cruise,
    ...(f.mach === undefined ? {} : { mach: f.mach }),
    fuelBurnKg: f.fuelKg,
    emission: f.emission,
    flightDate: f.date,
  };
}

export interface ParsedSchedule {
  flights: PreparedFlight[];
  /** Problems that refuse the file. */
  problems: ImportProblem[];
  /** Unknown or unnamed columns: reported, the file is still accepted. */
  warnings: ImportProblem[];
  /** Data rows read (blank lines not counted). */
  dataRows: number;
}

/** The key that makes a flight unique in a workspace (date, flight, origin, destination). */
export function flightKey(f: { date: string; flight: string; origin: string; destination: string }): string {
  return `${f.date}|${f.flight}|${f.origin}|${f.destination}`;
}

const PLACEHOLDER_EMISSION = { eiNoxGPerKg: 1 } as const;
/** Rows with unusual fuel listed one by one; past this, one line counts the rest. */
const MAX_FUEL_WARNINGS = 200;

/** Where a screening-input problem sits in the CSV. */
function columnOf(path: string, row: ScheduleRow, emissionFromRow: boolean): ScheduleColumn | '' {
  if (path === 'route.flightPlan.from') return 'origin';
  if (path === 'route.flightPlan.to') return 'destination';
  if (path.startsWith('route.flightPlan')) return 'route';
  if (path.startsWith('route.waypoints.0')) return 'origin';
  if (path.startsWith('route.waypoints.1')) return 'destination';
  if (path === 'cruise.flightLevel') return 'cruise_fl';
  if (path.startsWith('cruise')) return row.steps?.length ? 'steps' : 'cruise_fl';
  if (path === 'fuelBurnKg') return 'fuel_kg';
  if (path.startsWith('emission')) return emissionFromRow ? 'ei_nox_g_per_kg' : 'aircraft';
  if (path === 'mach') return row.mach !== undefined ? 'mach' : 'aircraft';
  if (path === 'flightDate') return 'date';
  return '';
}

function stepLabel(path: string, row: ScheduleRow): string {
  const m = /^cruise\.steps\.(\d+)/.exec(path);
  if (!m || !row.steps) return '';
  const i = Number(m[1]);
  const s = row.steps[i];
  return s ? `Step ${i + 1} (${s.flightLevel}@${s.fromKm}): ` : '';
}

type AddProblem = (column: string, message: string) => void;

/** The row's aircraft type and fleet (named in the row, else the type's default fleet). */
function checkAircraftAndFleet(
  row: ScheduleRow,
  ctx: ScheduleContext,
  add: AddProblem,
): { type: AircraftForScreening | undefined; fleetId: number | null } {
  const type = ctx.aircraft.get(row.aircraft);
  if (!type)
    add(
      'aircraft',
      `No aircraft type “${row.aircraft}” in this workspace. Add it under Engines & aircraft, or correct the code.`,
    );
  let fleetId: number | null = type?.defaultFleetId ?? null;
  if (row.fleet !== undefined) {
    const fleet = ctx.fleets.get(row.fleet.toLowerCase());
    if (!fleet)
      add(
        'fleet',
        `No fleet “${row.fleet}” in this workspace. Create it under Fleets, or leave the cell empty for the aircraft type’s default fleet.`,
      );
    else fleetId = fleet.id;
  }
  return { type, fleetId };
}

/** An airport code as the ICAO code to store, or null (with the problem added). */
function resolveAirport(code: string, column: 'origin' | 'destination', add: AddProblem): string | null {
  const airport = findAirport(code);
  if (!airport) {
    add(column, `Unknown airport “${code}”: give the ICAO or IATA code of a medium or large airport.`);
    return null;
  }
  if (!airport.icao) {
    add(column, `${airport.name} (${code}) has no ICAO code in our airport data; it cannot be stored.`);
    return null;
  }
  return airport.icao;
}

/** Origin and destination, resolved and different. */
function checkAirports(row: ScheduleRow, add: AddProblem): { origin: string | null; destination: string | null } {
  const origin = resolveAirport(row.origin, 'origin', add);
  const destination = resolveAirport(row.destination, 'destination', add);
  if (origin && destination && origin === destination) {
    add(
      'destination',
      `The destination is the origin airport (${origin}); a schedule row needs two different airports.`,
    );
  }
  return { origin, destination };
}

/** The row's own EI NOx, else the aircraft type's emission data. */
function emissionOfRow(
  row: ScheduleRow,
  type: AircraftForScreening | undefined,
  add: AddProblem,
): ScreeningInput['emission'] | null | undefined {
  const emission: ScreeningInput['emission'] | null | undefined =
    row.ei_nox_g_per_kg !== undefined ? { eiNoxGPerKg: row.ei_nox_g_per_kg } : type?.emission;
  if (type && !emission) {
    add(
      'aircraft',
      `Aircraft type ${type.code} has neither engine data nor a direct EI NOx. Add one under Engines & aircraft, or give ei_nox_g_per_kg.`,
    );
  }
  return emission;
}

/**
 * The screening input the row makes, checked by the engine's own validation; a flight-plan route is
 * read into waypoints with the workspace's library. Problems are reported by CSV column.
 */
function screeningInputOfRow(
  row: ScheduleRow,
  airports: { origin: string | null; destination: string | null },
  type: AircraftForScreening | undefined,
  emission: ScreeningInput['emission'] | null | undefined,
  library: RouteLibrary | undefined,
  add: AddProblem,
): { input?: ScreeningInput; waypoints?: { lat: number; lon: number }[] } {
  const { origin, destination } = airports;
  const emissionFromRow = row.ei_nox_g_per_kg !== undefined;
  const cruise = row.steps?.length ? { steps: row.steps } : { flightLevel: row.cruise_fl };
  const raw = {
    route:
      row.route !== undefined
        ? { flightPlan: { text: row.route, from: origin ?? row.origin, to: destination ?? row.destination } }
        : { waypoints: [{ airport: origin ?? row.origin }, { airport: destination ?? row.destination }] },
    cruise,
    mach: row.mach ?? type?.typicalMach,
    fuelBurnKg: row.fuel_kg,
    emission: emission ?? PLACEHOLDER_EMISSION,
    flightDate: row.date,
  };
  let input: ScreeningInput | undefined;
  let waypoints: { lat: number; lon: number }[] | undefined;
  try {
    input = validateScreeningInput(raw);
    if (origin && destination && 'flightPlan' in input.route) {
      const expanded = expandFlightPlanInput(input, library);
      const unresolved = expanded.flightPlan?.unresolved ?? [];
      if (unresolved.length > 0) {
        add(
          'route',
          `Not placed: ${unresolved.map((u) => `${u.item}${u.position !== null ? ` (character ${u.position + 1})` : ''}: ${u.reason}`).join(' ')}`,
        );
      }
      input = expanded.input;
      waypoints = expanded.input.route.waypoints.flatMap((w) => ('airport' in w ? [] : [{ lat: w.lat, lon: w.lon }]));
    }
  } catch (err) {
    if (!(err instanceof ScreeningInputError)) throw err;
    for (const f of err.fields) {
      const column = columnOf(f.path, row, emissionFromRow);
      // The placeholder emission stands in only so the other fields are still checked.
      if (column === 'aircraft' && !emission) continue;
      add(column, `${stepLabel(f.path, row)}${f.message}`);
    }
  }
  return { input, waypoints };
}

/**
 * Fuel against the route's distance (the great circle, cached per pair, or the flight plan's points),
 * per aircraft type where its engine is known: impossible fuel is a problem, unusual fuel a warning.
 */
function checkRowFuel(
  line: number,
  input: ScreeningInput,
  pair: string,
  waypoints: { lat: number; lon: number }[] | undefined,
  emission: ScreeningInput['emission'] | null | undefined,
  type: AircraftForScreening | undefined,
  distances: Map<string, number>,
  add: AddProblem,
): ImportProblem | undefined {
  let distanceKm = waypoints === undefined ? distances.get(pair) : undefined;
  if (distanceKm === undefined) {
    distanceKm = routeDistanceKm(input.route && 'waypoints' in input.route ? input.route.waypoints : []);
    if (waypoints === undefined) distances.set(pair, distanceKm);
  }
  const engine =
    emission && 'engine' in emission
      ? { fuelFlowKgS: emission.engine.fuelFlowKgS, engineCount: emission.engineCount }
      : null;
  const p = checkFuelPlausibility({
    distanceKm,
    fuelKg: input.fuelBurnKg,
    engine,
    mach: input.mach,
    aircraftCode: type?.code,
  });
  if (p.level === 'impossible') add('fuel_kg', p.message);
  else if (p.level === 'unusual') return { line, column: 'fuel_kg', message: p.message };
  return undefined;
}

/** Checks one data row; returns its problems and, when there are none, the flight. */
function checkRow(
  line: number,
  cells: ScheduleCells,
  ctx: ScheduleContext,
  seen: Map<string, number>,
  distances: Map<string, number>,
): { problems: ImportProblem[]; flight?: PreparedFlight; warning?: ImportProblem } {
  const problems: ImportProblem[] = [];
  const add: AddProblem = (column, message) => problems.push({ line, column, message });
  const parsed = scheduleRowSchema.safeParse(cells);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) add(String(issue.path[0] ?? ''), issue.message);
    return { problems };
  }
  const row = parsed.data;

  const { type, fleetId } = checkAircraftAndFleet(row, ctx, add);
  const { origin, destination } = checkAirports(row, add);
  const emission = emissionOfRow(row, type, add);
  const { input, waypoints } = screeningInputOfRow(row, { origin, destination }, type, emission, ctx.library, add);

  if (origin && destination) {
    const key = flightKey({ date: row.date, flight: row.flight, origin, destination });
    const first = seen.get(key);
    if (first !== undefined)
      add('flight', `This flight is already on line ${first} (same date, flight, origin and destination).`);
    else seen.set(key, line);
  }

  let warning: ImportProblem | undefined;
  if (input && origin && destination && origin !== destination) {
    warning = checkRowFuel(line, input, `${origin}-${destination}`, waypoints, emission, type, distances, add);
  }

  if (problems.length || !input || !type || !origin || !destination || !emission) return { problems };
  const levels = 'steps' in input.cruise ? input.cruise.steps.map((s) => s.flightLevel) : [input.cruise.flightLevel];
  return {
    problems,
    warning,
    flight: {
      line,
      date: row.date,
      flight: row.flight,
      origin,
      destination,
      aircraftTypeId: type.id,
      aircraftCode: type.code,
      fleetId,
      cruiseFl: levels[0],
      maxFl: Math.max(...levels),
      fuelKg: input.fuelBurnKg,
      cruise: input.cruise,
      mach: input.mach,
      emission,
      ...(waypoints === undefined ? {} : { waypoints }),
      fuelWarning: warning?.message ?? null,
    },
  };
}

type HeaderMap = CsvHeader<ScheduleColumn>;

function readHeader(cells: string[]): HeaderMap {
  return readCsvHeader(cells, SCHEDULE_COLUMNS, SCHEDULE_REQUIRED_COLUMNS);
}

/**
 * Streams the CSV through papaparse and checks every row as it is parsed. Throws a 413 AppError past
 * IMPORT_LIMITS.maxRows data rows. Line numbers count the header as line 1 (a quoted cell that
 * spans lines counts as one).
 */
export async function parseSchedule(source: ReadableStream<Uint8Array>, ctx: ScheduleContext): Promise<ParsedSchedule> {
  const decoder = new TextDecoderStream('utf-8', { fatal: true }) as unknown as ReadableWritablePair<
    string,
    Uint8Array
  >;
  const text = Readable.fromWeb(source.pipeThrough(decoder) as unknown as NodeReadableStream<string>);

  const out: ParsedSchedule = { flights: [], problems: [], warnings: [], dataRows: 0 };
  const seen = new Map<string, number>();
  const distances = new Map<string, number>();
  let fuelWarnings = 0;
  let header: HeaderMap | null = null;
  let line = 0;
  let stop: Error | null = null;

  const onRow = (record: string[], parser: Papa.Parser): void => {
    line += 1;
    if (header === null) {
      header = readHeader(record);
      out.problems.push(...header.problems);
      out.warnings.push(...header.warnings);
      if (header.problems.length) parser.abort();
      return;
    }
    if (record.every((c) => c.trim() === '')) return;
    out.dataRows += 1;
    if (out.dataRows > IMPORT_LIMITS.maxRows) {
      stop = tooLarge(
        `The file has more than ${IMPORT_LIMITS.maxRows.toLocaleString('en-GB')} flights. Split it into files of at most ${IMPORT_LIMITS.maxRows.toLocaleString('en-GB')} rows and upload them one by one.`,
      );
      parser.abort();
      return;
    }
    const cells: ScheduleCells = {};
    for (let i = 0; i < record.length; i++) {
      const value = record[i].trim();
      if (i >= header.byIndex.length) {
        if (value !== '') {
          out.problems.push({
            line,
            column: '',
            message: `This line has ${record.length} cells but the header has ${header.byIndex.length} columns: check for an unquoted comma.`,
          });
          return;
        }
        continue;
      }
      const column = header.byIndex[i];
      if (column && value !== '') cells[column] = value;
    }
    const checked = checkRow(line, cells, ctx, seen, distances);
    if (checked.problems.length) out.problems.push(...checked.problems);
    else if (checked.flight) {
      out.flights.push(checked.flight);
      if (checked.warning && ++fuelWarnings <= MAX_FUEL_WARNINGS) out.warnings.push(checked.warning);
    }
  };

  let decodeFailed = false;
  await new Promise<void>((resolve) => {
    text.on('error', () => {
      decodeFailed = true;
      resolve();
    });
    Papa.parse(text, {
      delimiter: ',',
      header: false,
      skipEmptyLines: false,
      step: (results: Papa.ParseStepResult<string[]>, parser: Papa.Parser) => {
        try {
          onRow(results.data, parser);
        } catch (err) {
          stop = err instanceof Error ? err : new Error(String(err));
          parser.abort();
        }
      },
      complete: () => resolve(),
      error: () => {
        decodeFailed = true;
        resolve();
      },
    });
  });
  text.destroy();
  if (stop) throw stop;
  if (decodeFailed)
    return { flights: [], problems: [NOT_UTF8_PROBLEM], warnings: out.warnings, dataRows: out.dataRows };
  if (header === null) {
    out.problems.push({
      line: 1,
      column: '',
      message: `The file is empty. The first line must name the columns: ${SCHEDULE_REQUIRED_COLUMNS.join(', ')}.`,
    });
  } else if (!out.problems.length && out.dataRows === 0) {
    out.problems.push({ line: 2, column: '', message: 'The file has a header row but no flights.' });
  }
  if (fuelWarnings > MAX_FUEL_WARNINGS) {
    out.warnings.push({
      line: 1,
      column: 'fuel_kg',
      message: `${fuelWarnings - MAX_FUEL_WARNINGS} more rows have unusual fuel for their distance (the first ${MAX_FUEL_WARNINGS} are listed).`,
    });
  }
  return out;
}

/** Problems sorted by line, then column. */
export function sortProblems(problems: ImportProblem[]): ImportProblem[] {
  return problems.sort((a, b) => a.line - b.line || a.column.localeCompare(b.column));
}
