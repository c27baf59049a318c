import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import Papa from 'papaparse';
import { findAirport, ScreeningInputError, validateScreeningInput, type ScreeningInput } from '@/lib/screening';
import { SCREENING_LIMITS } from '@/lib/validation/screening';
import {
  TRACK_COLUMNS,
  TRACK_IMPORT_LIMITS,
  TRACK_REQUIRED_COLUMNS,
  type TrackColumn,
} from '@/lib/validation/track-import';
import type { ImportProblem } from '@/lib/validation/imports';
import type { AircraftForScreening } from '@/db/aircraft-lookup';
import { tooLarge } from '@/lib/errors';
import type { PendingFlightFields } from '@/db/imports';
import { NOT_UTF8_PROBLEM, readCsvHeader } from './csv';

/**
 * Reading a flown-track CSV (DESIGN.md "Import formats", Tracks): streamed through papaparse, one
 * row a point, many flights a file. Points are kept per flight in typed arrays (a million points in
 * about 40 MB), never as the file's text; the file's SHA-256 is taken on the way through. Every cell
 * is checked as it is read; the flights are then checked as screening inputs against the workspace
 * (aircraft types, planned flights) in `prepareTrackFlights`, and the engine's field problems are
 * put back on the line and column they came from. Nothing here touches the database.
 */

class Column {
  data: Float64Array;
  length = 0;
  constructor(capacity = 64) {
    this.data = new Float64Array(capacity);
  }
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  at(i: number): number {
    return this.data[i];
  }
}

/** The points of one flight as read from the file. */
export interface TrackFlightPoints {
  flight: string;
  date: string;
  firstLine: number;
  origin: string | null;
  destination: string | null;
  aircraft: string | null;
  lines: Column;
  timeMs: Column;
  lat: Column;
  lon: Column;
  /** Flight level of each point (altitude_ft / 100 when the file gives feet). */
  level: Column;
  /** Whole-aircraft fuel flow, kg/h; NaN on a point without one. */
  fuelFlow: Column;
  flows: number;
  /** Column the levels came from, for problems. */
  levelColumn: 'altitude_ft' | 'flight_level';
}

export interface ParsedTracks {
  flights: TrackFlightPoints[];
  problems: ImportProblem[];
  warnings: ImportProblem[];
  points: number;
  fileHash: string;
}

const DATE_RE = /^\d{4}-\d{2}-\d{2}$/;
const TIME_RE = /^(\d{1,2}):(\d{2}):(\d{2})(\.\d{1,3})?$/;
const NUMBER_RE = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;
const DAY_MS = 86_400_000;

function dayMs(s: string): number {
  if (!DATE_RE.test(s)) return Number.NaN;
  const y = Number(s.slice(0, 4));
  const m = Number(s.slice(5, 7));
  const d = Number(s.slice(8, 10));
  if (y < 1900 || y > 2200) return Number.NaN;
  const t = Date.UTC(y, m - 1, d);
  const c = new Date(t);
  return c.getUTCFullYear() === y && c.getUTCMonth() === m - 1 && c.getUTCDate() === d ? t : Number.NaN;
}

function timeOfDayMs(s: string): number {
  const m = TIME_RE.exec(s);
  if (!m) return Number.NaN;
  const h = Number(m[1]);
  const mi = Number(m[2]);
  const se = Number(m[3]);
  if (h > 23 || mi > 59 || se > 59) return Number.NaN;
  return ((h * 60 + mi) * 60 + se) * 1000 + (m[4] ? Math.round(Number(m[4]) * 1000) : 0);
}

function numberCell(s: string | undefined): number | null {
  if (s === undefined || !NUMBER_RE.test(s)) return null;
  return Number(s);
}

interface HeaderMap {
  byIndex: (TrackColumn | null)[];
  problems: ImportProblem[];
  warnings: ImportProblem[];
}

function readHeader(cells: string[]): HeaderMap {
  const { byIndex, firstAt: seen, problems, warnings } = readCsvHeader(cells, TRACK_COLUMNS, TRACK_REQUIRED_COLUMNS);
  if (!seen.has('altitude_ft') && !seen.has('flight_level'))
    problems.push({
      line: 1,
      column: 'altitude_ft',
      message: 'Give the level of each point in a column altitude_ft (pressure altitude, ft) or flight_level.',
    });
  if (seen.has('altitude_ft') && seen.has('flight_level'))
    problems.push({
      line: 1,
      column: 'flight_level',
      message: 'Give the level in altitude_ft or in flight_level, not both.',
    });
  return { byIndex, problems, warnings };
}

type LevelColumn = TrackFlightPoints['levelColumn'];
type RowCells = Partial<Record<TrackColumn, string>>;

/** One checked point row, before it goes to its flight. */
interface TrackPoint {
  flight: string;
  date: string;
  /** Date plus time of day, ms since the epoch (before the past-midnight correction). */
  timeMs: number;
  lat: number;
  lon: number;
  level: number;
  /** kg/h; NaN without one. */
  fuelFlow: number;
  origin: string | null;
  destination: string | null;
  aircraft: string | null;
}

/** What reading the rows has gathered so far. */
interface RowReader {
  out: ParsedTracks;
  /** Flights by flight number, date, origin and destination. */
  byKey: Map<string, TrackFlightPoints>;
  header: HeaderMap | null;
  levelColumn: LevelColumn;
  /** The line being read; the header is line 1. */
  line: number;
}

/** How a row ends the reading: null to go on, 'abort' to stop (a refused header), an error to throw. */
type RowStop = null | 'abort' | Error;

/** Problems of point rows are kept up to a bound; a file full of errors lists the first of them. */
function addProblem(out: ParsedTracks, p: ImportProblem): void {
  if (out.problems.length < TRACK_IMPORT_LIMITS.maxProblemsListed * 4) out.problems.push(p);
}

function readHeaderRow(reader: RowReader, record: string[]): RowStop {
  const header = readHeader(record);
  reader.header = header;
  reader.levelColumn = header.byIndex.includes('altitude_ft') ? 'altitude_ft' : 'flight_level';
  reader.out.problems.push(...header.problems);
  reader.out.warnings.push(...header.warnings);
  return header.problems.length ? 'abort' : null;
}

/** A point row's non-empty cells by column; null when it has a filled cell past the header's columns. */
function rowCells(record: string[], byIndex: (TrackColumn | null)[]): RowCells | null {
  const cells: RowCells = {};
  for (let i = 0; i < record.length; i++) {
    const value = record[i].trim();
    if (i >= byIndex.length) {
      if (value !== '') return null;
      continue;
    }
    const column = byIndex[i];
    if (column && value !== '') cells[column] = value;
  }
  return cells;
}

type Flag = (column: TrackColumn, message: string) => void;

/** The point's flight level from altitude_ft (ft / 100) or flight_level; null (flagged) when out of range. */
function pointLevel(cells: RowCells, levelColumn: LevelColumn, flag: Flag): number | null {
  const { minFlightLevel, maxFlightLevel } = SCREENING_LIMITS;
  if (levelColumn === 'altitude_ft') {
    const ft = numberCell(cells.altitude_ft);
    if (ft !== null && ft >= minFlightLevel * 100 && ft <= maxFlightLevel * 100) return ft / 100;
    flag('altitude_ft', `Give the pressure altitude in ft, ${minFlightLevel * 100} to ${maxFlightLevel * 100}.`);
    return null;
  }
  const fl = numberCell(cells.flight_level?.replace(/^FL\s*/i, ''));
  if (fl !== null && fl >= minFlightLevel && fl <= maxFlightLevel) return fl;
  flag('flight_level', `Give the flight level, ${minFlightLevel} to ${maxFlightLevel}.`);
  return null;
}

/** The point's fuel flow, kg/h: NaN when the cell is empty, null (flagged) when out of range. */
function pointFuelFlow(cells: RowCells, flag: Flag): number | null {
  if (cells.fuel_flow_kg_h === undefined) return Number.NaN;
  const { minTrackFuelFlowKgH: min, maxTrackFuelFlowKgH: max } = SCREENING_LIMITS;
  const v = numberCell(cells.fuel_flow_kg_h);
  if (v !== null && v >= min && v <= max) return v;
  flag('fuel_flow_kg_h', `Give the fuel flow in kg/h for the whole aircraft, ${min} to ${max}.`);
  return null;
}

/** Checks every cell of a point row, flagging each bad one; null when any was bad. */
function checkPoint(cells: RowCells, levelColumn: LevelColumn, flag: Flag): TrackPoint | null {
  let bad = false;
  const check: Flag = (column, message) => {
    flag(column, message);
    bad = true;
  };
  const flight = cells.flight?.toUpperCase();
  if (!flight) check('flight', 'Give the flight number.');
  else if (flight.length > 16) check('flight', 'A flight number has at most 16 characters.');
  const day = dayMs(cells.date ?? '');
  if (!Number.isFinite(day))
    check(
      'date',
      cells.date ? 'Write the date as YYYY-MM-DD (UTC), a real calendar date.' : 'Give the date as YYYY-MM-DD (UTC).',
    );
  const tod = timeOfDayMs(cells.time ?? '');
  if (!Number.isFinite(tod)) check('time', 'Write the time as HH:MM:SS (UTC), such as 10:42:05.');
  const lat = numberCell(cells.lat);
  if (lat === null || lat < -90 || lat > 90) check('lat', 'Give the latitude in degrees, -90 to 90.');
  const lon = numberCell(cells.lon);
  if (lon === null || lon < -180 || lon > 180) check('lon', 'Give the longitude in degrees, -180 to 180.');
  const level = pointLevel(cells, levelColumn, check);
  const fuelFlow = pointFuelFlow(cells, check);
  if (bad || !flight || lat === null || lon === null || level === null || fuelFlow === null) return null;
  return {
    flight,
    date: cells.date as string,
    timeMs: day + tod,
    lat,
    lon,
    level,
    fuelFlow,
    origin: cells.origin?.toUpperCase() ?? null,
    destination: cells.destination?.toUpperCase() ?? null,
    aircraft: cells.aircraft?.toUpperCase() ?? null,
  };
}

function newFlight(p: TrackPoint, line: number, levelColumn: LevelColumn): TrackFlightPoints {
  return {
    flight: p.flight,
    date: p.date,
    firstLine: line,
    origin: p.origin,
    destination: p.destination,
    aircraft: p.aircraft,
    lines: new Column(),
    timeMs: new Column(),
    lat: new Column(),
    lon: new Column(),
    level: new Column(),
    fuelFlow: new Column(),
    flows: 0,
    levelColumn,
  };
}

/**
 * The flight a point belongs to (by flight number, date and, when given, origin and destination),
 * started on its first point; a problem when it names another aircraft type than the flight's first
 * point, a 413 past the flight limit.
 */
function flightOf(reader: RowReader, p: TrackPoint): TrackFlightPoints | ImportProblem | Error {
  const key = `${p.flight}|${p.date}|${p.origin ?? ''}|${p.destination ?? ''}`;
  const f = reader.byKey.get(key);
  if (f === undefined) {
    if (reader.byKey.size >= TRACK_IMPORT_LIMITS.maxFlights)
      return tooLarge(
        `The file has more than ${TRACK_IMPORT_LIMITS.maxFlights.toLocaleString('en-GB')} flights. Split it into smaller files and upload them one by one.`,
      );
    const started = newFlight(p, reader.line, reader.levelColumn);
    reader.byKey.set(key, started);
    reader.out.flights.push(started);
    return started;
  }
  if (p.aircraft !== null && f.aircraft !== null && p.aircraft !== f.aircraft)
    return {
      line: reader.line,
      column: 'aircraft',
      message: `Flight ${p.flight} on ${p.date} is ${f.aircraft} on line ${f.firstLine}: one aircraft type a flight.`,
    };
  return f;
}

/** Adds a point to its flight, in time order; a problem when its time runs backwards. */
function appendPoint(f: TrackFlightPoints, p: TrackPoint, line: number): ImportProblem | null {
  let t = p.timeMs;
  const n = f.timeMs.length;
  if (n > 0) {
    const prev = f.timeMs.at(n - 1);
    // Past midnight the clock starts again: a time far earlier than the one before is the next day.
    while (t < prev - DAY_MS / 2) t += DAY_MS;
    if (t < prev)
      return {
        line,
        column: 'time',
        message: `Time runs backwards here (line ${f.lines.at(n - 1)} of flight ${p.flight} is later): points of a flight must be in time order.`,
      };
  }
  f.lines.push(line);
  f.timeMs.push(t);
  f.lat.push(p.lat);
  f.lon.push(p.lon);
  f.level.push(p.level);
  f.fuelFlow.push(p.fuelFlow);
  if (!Number.isNaN(p.fuelFlow)) f.flows += 1;
  return null;
}

/** Reads one row of the file: the header first, then one point a row. */
function readRow(reader: RowReader, record: string[]): RowStop {
  reader.line += 1;
  const { out, header, line } = reader;
  if (header === null) return readHeaderRow(reader, record);
  if (record.every((c) => c.trim() === '')) return null;
  out.points += 1;
  if (out.points > TRACK_IMPORT_LIMITS.maxPoints)
    return tooLarge(
      `The file has more than ${TRACK_IMPORT_LIMITS.maxPoints.toLocaleString('en-GB')} points. Split it into smaller files and upload them one by one.`,
    );
  const cells = rowCells(record, header.byIndex);
  if (cells === null) {
    addProblem(out, {
      line,
      column: '',
      message: `This line has ${record.length} cells but the header has ${header.byIndex.length} columns: check for an unquoted comma.`,
    });
    return null;
  }
  const point = checkPoint(cells, reader.levelColumn, (column, message) => addProblem(out, { line, column, message }));
  if (point === null) return null;
  const f = flightOf(reader, point);
  if (f instanceof Error) return f;
  const problem = 'message' in f ? f : appendPoint(f, point, line);
  if (problem) addProblem(out, problem);
  return null;
}

interface StreamedText {
  fileHash: string;
  decodeFailed: boolean;
  /** A read error, an error thrown by `onRow` or the stop it asked for. */
  stop: Error | null;
}

/**
 * Streams the upload through papaparse as UTF-8 text, hashing every byte, and hands each row to
 * `onRow` until it asks to stop. After a stop the rest of the upload is only hashed.
 */
async function streamCsvRows(source: Readable, onRow: (record: string[]) => RowStop): Promise<StreamedText> {
  const hash = createHash('sha256');
  const decoder = new TextDecoder('utf-8', { fatal: true });
  let stop: Error | null = null;
  let decodeFailed = false;
  let aborted = false;
  // `parsing`: papaparse still wants text (false after an abort or once the text has ended).
  let parsing = true;
  let parseDone = false;
  await new Promise<void>((resolve) => {
    let sourceDone = false;
    const settle = () => {
      if (sourceDone && parseDone) resolve();
    };
    const text = new Readable({ read() {} });
    const endText = () => {
      if (parsing) text.push(null);
      parsing = false;
    };
    source.on('data', (chunk: Buffer) => {
      hash.update(chunk);
      if (!parsing) return;
      try {
        text.push(decoder.decode(chunk, { stream: true }));
      } catch {
        decodeFailed = true;
        endText();
      }
    });
    source.on('end', () => {
      if (parsing) {
        try {
          const rest = decoder.decode();
          if (rest) text.push(rest);
        } catch {
          decodeFailed = true;
        }
      }
      endText();
      sourceDone = true;
      settle();
    });
    source.on('error', (err) => {
      stop ??= err instanceof Error ? err : new Error(String(err));
      endText();
      sourceDone = true;
      settle();
    });
    Papa.parse(text as unknown as NodeJS.ReadableStream, {
      delimiter: ',',
      header: false,
      skipEmptyLines: false,
      step: (results: Papa.ParseStepResult<string[]>, parser: Papa.Parser) => {
        // The last line comes after the text has ended; nothing comes after an abort.
        if (stop || aborted || parseDone) return;
        let outcome: RowStop;
        try {
          outcome = onRow(results.data);
        } catch (err) {
          outcome = err instanceof Error ? err : new Error(String(err));
        }
        if (outcome === null) return;
        if (outcome instanceof Error) stop = outcome;
        aborted = true;
        parser.abort();
      },
      complete: () => {
        // An abort (a refused header, a limit) stops reading; the rest of the upload is only hashed.
        parsing = false;
        parseDone = true;
        settle();
      },
      error: () => {
        decodeFailed = true;
        parsing = false;
        parseDone = true;
        settle();
      },
    });
  });
  return { fileHash: hash.digest('hex'), decodeFailed, stop };
}

/**
 * Streams a track CSV and checks every cell; points go to their flight (by flight number, date and,
 * when given, origin and destination). Throws a 413 AppError past the point or flight limits.
 * Line numbers count the header as line 1.
 */
export async function parseTrackCsv(source: Readable): Promise<ParsedTracks> {
  const out: ParsedTracks = { flights: [], problems: [], warnings: [], points: 0, fileHash: '' };
  const reader: RowReader = { out, byKey: new Map(), header: null, levelColumn: 'flight_level', line: 0 };
  const streamed = await streamCsvRows(source, (record) => readRow(reader, record));
  if (streamed.stop) throw streamed.stop;
  out.fileHash = streamed.fileHash;
  if (streamed.decodeFailed) return { ...out, flights: [], problems: [NOT_UTF8_PROBLEM] };
  if (reader.header === null) {
    out.problems.push({
      line: 1,
      column: '',
      message: `The file is empty. The first line must name the columns: ${TRACK_REQUIRED_COLUMNS.join(', ')} and altitude_ft or flight_level.`,
    });
  } else if (!out.problems.length && out.points === 0) {
    out.problems.push({ line: 2, column: '', message: 'The file has a header row but no points.' });
  }
  return out;
}

/** A planned (schedule) flight a track may belong to. */
export interface PlannedFlightRef {
  id: number;
  date: string;
  flight: string;
  origin: string;
  destination: string;
  aircraftCode: string;
  fuelKg: number;
}

export interface TrackContext {
  aircraft: Map<string, AircraftForScreening>;
  /** The workspace's planned flights by `date|flight`. */
  planned: Map<string, PlannedFlightRef[]>;
  /** Keys (date|flight|origin|destination) of flown flights already in the workspace. */
  flownKeys: Set<string>;
}

/** A track flight that passed every check, ready to be stored as a pending flown flight. */
export interface PreparedTrackFlight extends PendingFlightFields {
  points: number;
  /** The validated screening input, as JSON. */
  inputJson: string;
}

function airportCode(code: string): string | null {
  const a = findAirport(code);
  return a === null ? null : (a.icao ?? code);
}

const TRACK_PATH_RE = /^route\.track\.points\.(\d+)(?:\.(\w+))?$/;

/** Where an engine problem of a track input sits in the file. */
function placeProblem(f: TrackFlightPoints, path: string, message: string): ImportProblem {
  const m = TRACK_PATH_RE.exec(path);
  if (m) {
    const i = Number(m[1]);
    const field = m[2];
    const column: string =
      field === 'time'
        ? 'time'
        : field === 'lat' || field === 'lon'
          ? field
          : field === 'fuelFlowKgH'
            ? 'fuel_flow_kg_h'
            : field === 'flightLevel' || field === 'pressureAltitudeFt'
              ? f.levelColumn
              : 'time';
    return { line: i < f.lines.length ? f.lines.at(i) : f.firstLine, column, message };
  }
  if (path === 'fuelBurnKg') return { line: f.firstLine, column: 'fuel_flow_kg_h', message };
  if (path.startsWith('emission') || path === 'mach') return { line: f.firstLine, column: 'aircraft', message };
  if (path === 'flightDate') return { line: f.firstLine, column: 'date', message };
  return { line: f.firstLine, column: 'flight', message: `${path ? `${path}: ` : ''}${message}` };
}

/** A track needs at least two points and at most the engine's limit. */
function pointCountProblem(f: TrackFlightPoints): string | null {
  const n = f.lines.length;
  if (n < SCREENING_LIMITS.minTrackPoints)
    return `Flight ${f.flight} on ${f.date} has ${n} point${n === 1 ? '' : 's'}: a track needs at least 2.`;
  if (n > SCREENING_LIMITS.maxTrackPoints)
    return `Flight ${f.flight} on ${f.date} has ${n} points: a track may have at most ${SCREENING_LIMITS.maxTrackPoints.toLocaleString('en-GB')}. Thin it (one point every few seconds is plenty).`;
  return null;
}

interface TrackRoute {
  origin: string;
  destination: string;
  /** The one planned flight the track matches (same number, date and the airports the file gives). */
  plannedTwin: PlannedFlightRef | null;
}

/**
 * The flight's airports: the file's (known codes, as ICAO where there is one), else its planned
 * flight's. Problems when a code is unknown or no single planned flight fills in a missing airport.
 */
function resolveRoute(f: TrackFlightPoints, ctx: TrackContext): TrackRoute | ImportProblem[] {
  const at = (column: string, message: string): ImportProblem => ({ line: f.firstLine, column, message });
  const origin = f.origin === null ? null : airportCode(f.origin);
  const destination = f.destination === null ? null : airportCode(f.destination);
  const unknown: ImportProblem[] = [];
  if (f.origin !== null && origin === null)
    unknown.push(at('origin', `No airport with the code ${f.origin} is known.`));
  if (f.destination !== null && destination === null)
    unknown.push(at('destination', `No airport with the code ${f.destination} is known.`));
  if (unknown.length) return unknown;
  const candidates = ctx.planned.get(`${f.date}|${f.flight}`) ?? [];
  const matching = candidates.filter(
    (p) => (origin === null || p.origin === origin) && (destination === null || p.destination === destination),
  );
  const plannedTwin = matching.length === 1 ? matching[0] : null;
  if (origin !== null && destination !== null) return { origin, destination, plannedTwin };
  if (plannedTwin === null)
    return [
      at(
        origin === null ? 'origin' : 'destination',
        matching.length > 1
          ? `Flight ${f.flight} on ${f.date} is planned more than once in this workspace: give origin and destination to say which one this track is.`
          : `Give origin and destination: no planned flight ${f.flight} on ${f.date} in this workspace gives them.`,
      ),
    ];
  return { origin: plannedTwin.origin, destination: plannedTwin.destination, plannedTwin };
}

/** The flight's aircraft type (the file's, else its planned flight's), which must be in the workspace and complete. */
function resolveAircraftType(
  f: TrackFlightPoints,
  plannedTwin: PlannedFlightRef | null,
  ctx: TrackContext,
): AircraftForScreening | string {
  const code = f.aircraft ?? plannedTwin?.aircraftCode ?? null;
  if (code === null) return `Give the aircraft type: no planned flight ${f.flight} on ${f.date} gives it.`;
  const type = ctx.aircraft.get(code.toUpperCase());
  if (type === undefined)
    return `No aircraft type ${code} in this workspace: add it on the Engines & aircraft page or fix the code.`;
  if (type.emission === null)
    return `The aircraft type ${type.code} has neither an engine nor a direct EI NOx; complete it first.`;
  return type;
}

/** Fuel flows on every point or on none, and without them a planned flight whose fuel is spread along the track. */
function fuelProblem(f: TrackFlightPoints, route: TrackRoute): ImportProblem | null {
  const n = f.lines.length;
  if (f.flows > 0 && f.flows < n) {
    let i = 0;
    while (i < n && !Number.isNaN(f.fuelFlow.at(i))) i++;
    return {
      line: f.lines.at(i),
      column: 'fuel_flow_kg_h',
      message: 'Give a fuel flow on every point of the flight, or on none (the planned fuel is then spread by time).',
    };
  }
  if (f.flows === 0 && route.plannedTwin === null)
    return {
      line: f.firstLine,
      column: 'fuel_flow_kg_h',
      message: `Give fuel_flow_kg_h on the points of ${f.flight}: without it the planned flight’s fuel is spread along the track, and no planned flight ${f.flight} on ${f.date} from ${route.origin} to ${route.destination} is in this workspace.`,
    };
  return null;
}

/** The raw screening input of a track flight, before the engine's checks. */
function rawTrackInput(
  f: TrackFlightPoints,
  emission: AircraftForScreening['emission'],
  plannedTwin: PlannedFlightRef | null,
): Record<string, unknown> {
  const n = f.lines.length;
  const points = new Array<Record<string, number | string>>(n);
  for (let i = 0; i < n; i++) {
    const level = f.level.at(i);
    const p: Record<string, number | string> = {
      time: new Date(f.timeMs.at(i)).toISOString(),
      lat: f.lat.at(i),
      lon: f.lon.at(i),
    };
    if (f.levelColumn === 'altitude_ft') p.pressureAltitudeFt = level * 100;
    else p.flightLevel = level;
    if (f.flows > 0) p.fuelFlowKgH = f.fuelFlow.at(i);
    points[i] = p;
  }
  const raw: Record<string, unknown> = {
    route: { track: { points } },
    emission,
    flightDate: f.date,
  };
  if (f.flows === 0 && plannedTwin !== null) raw.fuelBurnKg = plannedTwin.fuelKg;
  return raw;
}

/**
 * The highest level of the track, and the cruise shown for the flight: the level most of its points
 * were flown at (whole flight levels; the higher one on a tie).
 */
function trackLevels(f: TrackFlightPoints): { cruiseFl: number; maxFl: number } {
  const n = f.lines.length;
  let maxFl = 0;
  for (let i = 0; i < n; i++) maxFl = Math.max(maxFl, f.level.at(i));
  const counts = new Map<number, number>();
  let cruiseFl = Math.round(maxFl);
  let best = 0;
  for (let i = 0; i < n; i++) {
    const level = Math.round(f.level.at(i));
    const c = (counts.get(level) ?? 0) + 1;
    counts.set(level, c);
    if (c > best || (c === best && level > cruiseFl)) {
      best = c;
      cruiseFl = level;
    }
  }
  return { cruiseFl: Math.round(cruiseFl), maxFl: Math.round(maxFl) };
}

/**
 * Checks one parsed flight and builds its screening input; its problems instead when it fails a
 * check. `seen` holds the flights of the file met so far (by date, number and airports) with their first line.
 */
function prepareTrackFlight(
  f: TrackFlightPoints,
  ctx: TrackContext,
  seen: Map<string, number>,
): PreparedTrackFlight | ImportProblem[] {
  const at = (column: string, message: string): ImportProblem[] => [{ line: f.firstLine, column, message }];
  const countProblem = pointCountProblem(f);
  if (countProblem !== null) return at('flight', countProblem);
  const route = resolveRoute(f, ctx);
  if (Array.isArray(route)) return route;
  const { origin, destination, plannedTwin } = route;
  const key = `${f.date}|${f.flight}|${origin}|${destination}`;
  const earlier = seen.get(key);
  if (earlier !== undefined)
    return at(
      'flight',
      `Flight ${f.flight} on ${f.date} from ${origin} to ${destination} is already on line ${earlier}; give each flight’s points once.`,
    );
  seen.set(key, f.firstLine);
  if (ctx.flownKeys.has(key))
    return at(
      'flight',
      `The flown track of ${f.flight} on ${f.date} from ${origin} to ${destination} is already in this workspace; it is not imported or billed twice. Remove its points.`,
    );
  const type = resolveAircraftType(f, plannedTwin, ctx);
  if (typeof type === 'string') return at('aircraft', type);
  const fuel = fuelProblem(f, route);
  if (fuel !== null) return [fuel];
  let input: ScreeningInput;
  try {
    input = validateScreeningInput(rawTrackInput(f, type.emission, plannedTwin));
  } catch (err) {
    if (!(err instanceof ScreeningInputError)) throw err;
    return err.fields.slice(0, 20).map((p) => placeProblem(f, p.path, p.message));
  }
  return {
    line: f.firstLine,
    date: f.date,
    flight: f.flight,
    origin,
    destination,
    aircraftTypeId: type.id,
    aircraftCode: type.code,
    fleetId: type.defaultFleetId,
    ...trackLevels(f),
    fuelKg: input.fuelBurnKg,
    points: f.lines.length,
    inputJson: JSON.stringify(input),
  };
}

/**
 * Checks each parsed flight against the workspace and the engine's input rules and builds its
 * screening input. A flight takes origin, destination, aircraft type and (without fuel flows) the
 * fuel from its planned flight (same flight number and date) where the file leaves them out.
 */
export function prepareTrackFlights(
  parsed: ParsedTracks,
  ctx: TrackContext,
): { flights: PreparedTrackFlight[]; problems: ImportProblem[] } {
  const problems: ImportProblem[] = [];
  const flights: PreparedTrackFlight[] = [];
  const seen = new Map<string, number>();
  for (const f of parsed.flights) {
    const prepared = prepareTrackFlight(f, ctx, seen);
    if (Array.isArray(prepared)) problems.push(...prepared);
    else flights.push(prepared);
  }
  return { flights, problems };
}

/** The template offered on the imports page: two short invented flights with fuel flows, importable as they are. */
export function trackTemplateCsv(opts: { aircraft: string; day: string }): string {
  const rows: string[] = ['flight,date,time,lat,lon,altitude_ft,fuel_flow_kg_h,aircraft,origin,destination'];
  const legs: [string, string, string, number, number, number, number][] = [
    ['XY101', 'EFHK', 'PANC', 60.3172, 24.9633, 64.0, 30.0],
    ['XY102', 'KEF', 'ANC', 63.985, -22.6056, 64.5, -40.0],
  ];
  for (const [flight, origin, destination, lat0, lon0, lat1, lon1] of legs) {
    for (let i = 0; i <= 10; i++) {
      const f = i / 10;
      const alt = i === 0 || i === 10 ? 2000 : i === 1 || i === 9 ? 20000 : 37000;
      const flow = i === 0 ? 9000 : i === 1 ? 8000 : 6800;
      const minutes = i * 6;
      const time = `10:${String(minutes).padStart(2, '0')}:00`;
      rows.push(
        [
          flight,
          opts.day,
          minutes < 60 ? time : `11:00:00`,
          (lat0 + (lat1 - lat0) * f).toFixed(4),
          (lon0 + (lon1 - lon0) * f).toFixed(4),
          String(alt),
          String(flow),
          opts.aircraft,
          origin,
          destination,
        ].join(','),
      );
    }
  }
  return rows.join('\r\n') + '\r\n';
}
