import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import Papa from 'papaparse';
import { findAirport, ScreeningInputError, validateScreeningInput, type ScreeningInput } from '@/lib/screening';
import { SCREENING_LIMITS } from '@/lib/validation/screening';
import {
  TRACK_COLUMNS,
  TRACK_IMPORT_LIMITS,
  TRACK_REQUIRED_COLUMNS,
  isTrackColumn,
  type TrackColumn,
} from '@/lib/validation/track-import';
import type { ImportProblem } from '@/lib/validation/imports';
import type { AircraftForScreening } from '@/db/aircraft-lookup';
import { tooLarge } from '@/lib/errors';

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
  const byIndex: (TrackColumn | null)[] = [];
  const problems: ImportProblem[] = [];
  const warnings: ImportProblem[] = [];
  const seen = new Map<string, number>();
  cells.forEach((raw, i) => {
    const name = (i === 0 ? raw.replace(/^\uFEFF/, '') : raw).trim().toLowerCase();
    if (name === '' || !isTrackColumn(name)) {
      byIndex.push(null);
      warnings.push({
        line: 1,
        column: name === '' ? `(column ${i + 1})` : raw.trim(),
        message:
          name === ''
            ? `Column ${i + 1} has no name; its cells were ignored.`
            : `Unknown column “${raw.trim()}”: it was ignored. Known columns: ${TRACK_COLUMNS.join(', ')}.`,
      });
      return;
    }
    const earlier = seen.get(name);
    if (earlier !== undefined) {
      byIndex.push(null);
      problems.push({
        line: 1,
        column: name,
        message: `The column ${name} appears twice (columns ${earlier + 1} and ${i + 1}); keep one.`,
      });
      return;
    }
    seen.set(name, i);
    byIndex.push(name);
  });
  for (const required of TRACK_REQUIRED_COLUMNS) {
    if (!seen.has(required))
      problems.push({
        line: 1,
        column: required,
        message: `The required column ${required} is missing from the header row.`,
      });
  }
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

const NOT_UTF8: ImportProblem = {
  line: 0,
  column: '',
  message: 'The file is not UTF-8 text. Save it as “CSV UTF-8 (comma delimited)” and upload it again.',
};

/**
 * Streams a track CSV and checks every cell; points go to their flight (by flight number, date and,
 * when given, origin and destination). Throws a 413 AppError past the point or flight limits.
 * Line numbers count the header as line 1.
 */
export async function parseTrackCsv(source: Readable): Promise<ParsedTracks> {
  const hash = createHash('sha256');
  const decoder = new TextDecoder('utf-8', { fatal: true });
  const out: ParsedTracks = { flights: [], problems: [], warnings: [], points: 0, fileHash: '' };
  const byKey = new Map<string, TrackFlightPoints>();
  let header: HeaderMap | null = null;
  let line = 0;
  let stop: Error | null = null;
  let decodeFailed = false;
  let aborted = false;
  const abort = (parser: Papa.Parser) => {
    aborted = true;
    parser.abort();
  };
  const problem = (p: ImportProblem) => {
    if (out.problems.length < TRACK_IMPORT_LIMITS.maxProblemsListed * 4) out.problems.push(p);
  };

  const onRow = (record: string[], parser: Papa.Parser): void => {
    line += 1;
    if (header === null) {
      header = readHeader(record);
      out.problems.push(...header.problems);
      out.warnings.push(...header.warnings);
      if (header.problems.length) abort(parser);
      return;
    }
    if (record.every((c) => c.trim() === '')) return;
    out.points += 1;
    if (out.points > TRACK_IMPORT_LIMITS.maxPoints) {
      stop = tooLarge(
        `The file has more than ${TRACK_IMPORT_LIMITS.maxPoints.toLocaleString('en-GB')} points. Split it into smaller files and upload them one by one.`,
      );
      abort(parser);
      return;
    }
    const cells: Partial<Record<TrackColumn, string>> = {};
    for (let i = 0; i < record.length; i++) {
      const value = record[i].trim();
      if (i >= header.byIndex.length) {
        if (value !== '') {
          problem({
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
    let bad = false;
    const flag = (column: TrackColumn, message: string) => {
      problem({ line, column, message });
      bad = true;
    };
    const flight = cells.flight?.toUpperCase();
    if (!flight) flag('flight', 'Give the flight number.');
    else if (flight.length > 16) flag('flight', 'A flight number has at most 16 characters.');
    const day = dayMs(cells.date ?? '');
    if (!Number.isFinite(day))
      flag(
        'date',
        cells.date ? 'Write the date as YYYY-MM-DD (UTC), a real calendar date.' : 'Give the date as YYYY-MM-DD (UTC).',
      );
    const tod = timeOfDayMs(cells.time ?? '');
    if (!Number.isFinite(tod)) flag('time', 'Write the time as HH:MM:SS (UTC), such as 10:42:05.');
    const lat = numberCell(cells.lat);
    if (lat === null || lat < -90 || lat > 90) flag('lat', 'Give the latitude in degrees, -90 to 90.');
    const lon = numberCell(cells.lon);
    if (lon === null || lon < -180 || lon > 180) flag('lon', 'Give the longitude in degrees, -180 to 180.');
    let level: number | null = null;
    const levelColumn: 'altitude_ft' | 'flight_level' = header.byIndex.includes('altitude_ft')
      ? 'altitude_ft'
      : 'flight_level';
    if (levelColumn === 'altitude_ft') {
      const ft = numberCell(cells.altitude_ft);
      if (ft === null || ft < SCREENING_LIMITS.minFlightLevel * 100 || ft > SCREENING_LIMITS.maxFlightLevel * 100)
        flag(
          'altitude_ft',
          `Give the pressure altitude in ft, ${SCREENING_LIMITS.minFlightLevel * 100} to ${SCREENING_LIMITS.maxFlightLevel * 100}.`,
        );
      else level = ft / 100;
    } else {
      const fl = numberCell(cells.flight_level?.replace(/^FL\s*/i, ''));
      if (fl === null || fl < SCREENING_LIMITS.minFlightLevel || fl > SCREENING_LIMITS.maxFlightLevel)
        flag(
          'flight_level',
          `Give the flight level, ${SCREENING_LIMITS.minFlightLevel} to ${SCREENING_LIMITS.maxFlightLevel}.`,
        );
      else level = fl;
    }
    let ff = Number.NaN;
    if (cells.fuel_flow_kg_h !== undefined) {
      const v = numberCell(cells.fuel_flow_kg_h);
      if (v === null || v < SCREENING_LIMITS.minTrackFuelFlowKgH || v > SCREENING_LIMITS.maxTrackFuelFlowKgH)
        flag(
          'fuel_flow_kg_h',
          `Give the fuel flow in kg/h for the whole aircraft, ${SCREENING_LIMITS.minTrackFuelFlowKgH} to ${SCREENING_LIMITS.maxTrackFuelFlowKgH}.`,
        );
      else ff = v;
    }
    const origin = cells.origin?.toUpperCase() ?? null;
    const destination = cells.destination?.toUpperCase() ?? null;
    const aircraft = cells.aircraft?.toUpperCase() ?? null;
    if (bad || !flight) return;
    const date = cells.date as string;
    const key = `${flight}|${date}|${origin ?? ''}|${destination ?? ''}`;
    let f = byKey.get(key);
    if (f === undefined) {
      if (byKey.size >= TRACK_IMPORT_LIMITS.maxFlights) {
        stop = tooLarge(
          `The file has more than ${TRACK_IMPORT_LIMITS.maxFlights.toLocaleString('en-GB')} flights. Split it into smaller files and upload them one by one.`,
        );
        abort(parser);
        return;
      }
      f = {
        flight,
        date,
        firstLine: line,
        origin,
        destination,
        aircraft,
        lines: new Column(),
        timeMs: new Column(),
        lat: new Column(),
        lon: new Column(),
        level: new Column(),
        fuelFlow: new Column(),
        flows: 0,
        levelColumn,
      };
      byKey.set(key, f);
      out.flights.push(f);
    } else if (aircraft !== null && f.aircraft !== null && aircraft !== f.aircraft) {
      problem({
        line,
        column: 'aircraft',
        message: `Flight ${flight} on ${date} is ${f.aircraft} on line ${f.firstLine}: one aircraft type a flight.`,
      });
      return;
    }
    let t = day + tod;
    const n = f.timeMs.length;
    if (n > 0) {
      const prev = f.timeMs.at(n - 1);
      // Past midnight the clock starts again: a time far earlier than the one before is the next day.
      while (t < prev - DAY_MS / 2) t += DAY_MS;
      if (t < prev) {
        problem({
          line,
          column: 'time',
          message: `Time runs backwards here (line ${f.lines.at(n - 1)} of flight ${flight} is later): points of a flight must be in time order.`,
        });
        return;
      }
    }
    f.lines.push(line);
    f.timeMs.push(t);
    f.lat.push(lat as number);
    f.lon.push(lon as number);
    f.level.push(level as number);
    f.fuelFlow.push(ff);
    if (!Number.isNaN(ff)) f.flows += 1;
  };

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
        try {
          onRow(results.data, parser);
        } catch (err) {
          stop = err instanceof Error ? err : new Error(String(err));
          abort(parser);
        }
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
  if (stop) throw stop;
  out.fileHash = hash.digest('hex');
  if (decodeFailed) return { ...out, flights: [], problems: [NOT_UTF8] };
  if (header === null) {
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
export interface PreparedTrackFlight {
  line: number;
  date: string;
  flight: string;
  origin: string;
  destination: string;
  aircraftTypeId: number;
  aircraftCode: string;
  fleetId: number | null;
  cruiseFl: number;
  maxFl: number;
  fuelKg: number;
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
    const n = f.lines.length;
    const at = (column: string, message: string) => problems.push({ line: f.firstLine, column, message });
    if (n < SCREENING_LIMITS.minTrackPoints) {
      at('flight', `Flight ${f.flight} on ${f.date} has ${n} point${n === 1 ? '' : 's'}: a track needs at least 2.`);
      continue;
    }
    if (n > SCREENING_LIMITS.maxTrackPoints) {
      at(
        'flight',
        `Flight ${f.flight} on ${f.date} has ${n} points: a track may have at most ${SCREENING_LIMITS.maxTrackPoints.toLocaleString('en-GB')}. Thin it (one point every few seconds is plenty).`,
      );
      continue;
    }
    const candidates = ctx.planned.get(`${f.date}|${f.flight}`) ?? [];
    let origin = f.origin === null ? null : airportCode(f.origin);
    let destination = f.destination === null ? null : airportCode(f.destination);
    if (f.origin !== null && origin === null) at('origin', `No airport with the code ${f.origin} is known.`);
    if (f.destination !== null && destination === null)
      at('destination', `No airport with the code ${f.destination} is known.`);
    if ((f.origin !== null && origin === null) || (f.destination !== null && destination === null)) continue;
    const matching = candidates.filter(
      (p) => (origin === null || p.origin === origin) && (destination === null || p.destination === destination),
    );
    const plannedTwin = matching.length === 1 ? matching[0] : null;
    if (origin === null || destination === null) {
      if (plannedTwin === null) {
        at(
          origin === null ? 'origin' : 'destination',
          matching.length > 1
            ? `Flight ${f.flight} on ${f.date} is planned more than once in this workspace: give origin and destination to say which one this track is.`
            : `Give origin and destination: no planned flight ${f.flight} on ${f.date} in this workspace gives them.`,
        );
        continue;
      }
      origin = plannedTwin.origin;
      destination = plannedTwin.destination;
    }
    const key = `${f.date}|${f.flight}|${origin}|${destination}`;
    const earlier = seen.get(key);
    if (earlier !== undefined) {
      at(
        'flight',
        `Flight ${f.flight} on ${f.date} from ${origin} to ${destination} is already on line ${earlier}; give each flight’s points once.`,
      );
      continue;
    }
    seen.set(key, f.firstLine);
    if (ctx.flownKeys.has(key)) {
      at(
        'flight',
        `The flown track of ${f.flight} on ${f.date} from ${origin} to ${destination} is already in this workspace; it is not imported or billed twice. Remove its points.`,
      );
      continue;
    }
    const code = f.aircraft ?? plannedTwin?.aircraftCode ?? null;
    if (code === null) {
      at('aircraft', `Give the aircraft type: no planned flight ${f.flight} on ${f.date} gives it.`);
      continue;
    }
    const type = ctx.aircraft.get(code.toUpperCase());
    if (type === undefined) {
      at(
        'aircraft',
        `No aircraft type ${code} in this workspace: add it on the Engines & aircraft page or fix the code.`,
      );
      continue;
    }
    if (type.emission === null) {
      at('aircraft', `The aircraft type ${type.code} has neither an engine nor a direct EI NOx; complete it first.`);
      continue;
    }
    if (f.flows > 0 && f.flows < n) {
      let i = 0;
      while (i < n && !Number.isNaN(f.fuelFlow.at(i))) i++;
      problems.push({
        line: f.lines.at(i),
        column: 'fuel_flow_kg_h',
        message: 'Give a fuel flow on every point of the flight, or on none (the planned fuel is then spread by time).',
      });
      continue;
    }
    if (f.flows === 0 && plannedTwin === null) {
      at(
        'fuel_flow_kg_h',
        `Give fuel_flow_kg_h on the points of ${f.flight}: without it the planned flight’s fuel is spread along the track, and no planned flight ${f.flight} on ${f.date} from ${origin} to ${destination} is in this workspace.`,
      );
      continue;
    }
    const points = new Array<Record<string, number | string>>(n);
    let maxFl = 0;
    for (let i = 0; i < n; i++) {
      const level = f.level.at(i);
      if (level > maxFl) maxFl = level;
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
      emission: type.emission,
      flightDate: f.date,
    };
    if (f.flows === 0 && plannedTwin !== null) raw.fuelBurnKg = plannedTwin.fuelKg;
    let input: ScreeningInput;
    try {
      input = validateScreeningInput(raw);
    } catch (err) {
      if (!(err instanceof ScreeningInputError)) throw err;
      for (const p of err.fields.slice(0, 20)) problems.push(placeProblem(f, p.path, p.message));
      continue;
    }
    // The cruise shown for the flight: the level most of its points were flown at (whole flight levels).
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
    flights.push({
      line: f.firstLine,
      date: f.date,
      flight: f.flight,
      origin,
      destination,
      aircraftTypeId: type.id,
      aircraftCode: type.code,
      fleetId: type.defaultFleetId,
      cruiseFl: Math.round(cruiseFl),
      maxFl: Math.round(maxFl),
      fuelKg: input.fuelBurnKg,
      points: n,
      inputJson: JSON.stringify(input),
    });
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
