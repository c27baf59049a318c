import { z } from 'zod';
import {
  OZONE_PROFILE_NAMES,
  SCREENING_LIMITS,
  screeningInputSchema,
  type ScreeningInputRaw,
  type SoundingLevelInput,
} from '@/lib/validation/screening';

/**
 * The "Screen a flight" form: what the planner types (text in the user's units) and how it maps to
 * the engine input of `screeningInputSchema`. Client-safe. Every range the engine checks is checked
 * again through `screeningInputSchema` itself, so limits and wording live in one place; only the
 * fields entered in the user's units (fuel, step starts, tropopause altitude) are range-checked here
 * first, so the message speaks the unit the planner typed.
 */
import { altitudeToM, distanceToKm, fuelToKg, KG_PER_LB, KM_PER_NM, M_PER_FT, type UnitSystem } from '@/lib/units';

export const ROUTE_MODES = ['airports', 'points', 'flightPlan'] as const;
export const CRUISE_MODES = ['level', 'steps'] as const;
export const EMISSION_MODES = ['aircraft', 'engine', 'direct'] as const;
export const TROPOPAUSE_MODES = ['climatology', 'altitude', 'pressure', 'sounding'] as const;
export const BAND_KEYS = ['jO3NoonPerS', 'jNo2NoonPerS', 'daylightFactor', 'noxToNoyFraction'] as const;
export type BandKey = (typeof BAND_KEYS)[number];

export interface BandText {
  low: string;
  central: string;
  high: string;
}

export interface ScreenFormValues {
  name: string;
  routeMode: (typeof ROUTE_MODES)[number];
  airports: { code: string }[];
  points: { lat: string; lon: string }[];
  /** An ICAO flight plan's route (item 15) between two aerodrome codes. */
  flightPlan: { text: string; from: string; to: string };
  cruiseMode: (typeof CRUISE_MODES)[number];
  flightLevel: string;
  /**
   * `from` is km along the route (metric) or NM (imperial); the first row is always 0. `at`, when
   * set, places the step at that waypoint (its index in the route) instead of at a distance.
   */
  steps: { from: string; flightLevel: string; at?: string }[];
  /** Cruise fuel in kg (metric) or lb (imperial). */
  fuelBurn: string;
  emissionMode: (typeof EMISSION_MODES)[number];
  aircraft: string;
  engineId: string;
  engineCount: string;
  method: 'bffm2' | 'dlr';
  eiNox: string;
  mach: string;
  flightDate: string;
  /** '' = take the month from the date (or the annual mean without one). */
  month: string;
  tropopauseMode: (typeof TROPOPAUSE_MODES)[number];
  /** m (metric) or ft (imperial). */
  tropopauseAltitude: string;
  tropopausePressure: string;
  soundingId: string;
  assumptions: {
    jO3NoonPerS: BandText;
    jNo2NoonPerS: BandText;
    daylightFactor: BandText;
    noxToNoyFraction: BandText;
    ohCm3: string;
    ho2Cm3: string;
    /** Per cent (60 for 60 %). */
    relativeHumidity: string;
    /** '' = by latitude band and season. */
    ozoneProfile: string;
  };
}

interface Band {
  low: number;
  central: number;
  high: number;
}

/** The documented defaults of the ozone-figure inputs, handed from the engine by the page. */
export interface AssumptionDefaults {
  jO3NoonPerS: Band;
  jNo2NoonPerS: Band;
  daylightFactor: Band;
  noxToNoyFraction: Band;
  ohCm3: number;
  ho2Cm3: number;
  relativeHumidity: number;
  residenceTime: { depthKm: readonly number[]; years: readonly number[]; lowFactor: number; highFactor: number };
}

/** What the form knows of the workspace to build an engine input. */
export interface ScreenFormContext {
  units: UnitSystem;
  defaults: AssumptionDefaults;
  aircraft: { code: string; emission: ScreeningInputRaw['emission'] | null; typicalMach: number }[];
  engines: {
    id: number;
    fuelFlowKgS: [number, number, number, number];
    eiNoxGPerKg: [number, number, number, number];
  }[];
  soundings: { id: number; levels: SoundingLevelInput[] }[];
}

/** A step climb as the endpoints accept it: at a distance, or at a waypoint (its index in the route). */
export type StepBody = { fromKm: number; flightLevel: number } | { atWaypoint: number; flightLevel: number };

/** The body the preview and save endpoints accept: the engine input plus our extras. */
export type ScreeningRequestBody = Omit<Partial<ScreeningInputRaw>, 'cruise'> & {
  cruise?: { flightLevel: number } | { steps: StepBody[] };
  aircraft?: string;
  name?: string;
};

export interface FormProblem {
  path: string;
  message: string;
}

const emptyBand = (): BandText => ({ low: '', central: '', high: '' });

export function emptyScreenForm(defaultDate = ''): ScreenFormValues {
  return {
    name: '',
    routeMode: 'airports',
    airports: [{ code: '' }, { code: '' }],
    points: [
      { lat: '', lon: '' },
      { lat: '', lon: '' },
    ],
    flightPlan: { text: '', from: '', to: '' },
    cruiseMode: 'level',
    flightLevel: '350',
    steps: [
      { from: '0', flightLevel: '350' },
      { from: '', flightLevel: '370' },
    ],
    fuelBurn: '',
    emissionMode: 'aircraft',
    aircraft: '',
    engineId: '',
    engineCount: '2',
    method: 'bffm2',
    eiNox: '',
    mach: '',
    flightDate: defaultDate,
    month: '',
    tropopauseMode: 'climatology',
    tropopauseAltitude: '',
    tropopausePressure: '',
    soundingId: '',
    assumptions: {
      jO3NoonPerS: emptyBand(),
      jNo2NoonPerS: emptyBand(),
      daylightFactor: emptyBand(),
      noxToNoyFraction: emptyBand(),
      ohCm3: '',
      ho2Cm3: '',
      relativeHumidity: '',
      ozoneProfile: '',
    },
  };
}

/**
 * Reads a number as planners type it: spaces and thin spaces as thousands separators, commas as
 * thousands separators when grouped in threes ("60,000"), a lone decimal comma ("0,85"), and
 * scientific notation ("4.5e-4"). Returns null for anything else.
 */
export function readNumber(text: string): number | null {
  let s = text.replace(/[\s\u00a0\u2009\u202f_]/g, '');
  if (s === '') return null;
  if (/^[+-]?\d{1,3}(,\d{3})+(\.\d+)?$/.test(s)) s = s.replace(/,/g, '');
  else if (/^[+-]?\d+,\d+$/.test(s)) s = s.replace(',', '.');
  if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(s)) return null;
  const n = Number(s);
  return Number.isFinite(n) ? n : null;
}

function plain(n: number, digits = 0): string {
  const f = 10 ** digits;
  return new Intl.NumberFormat('en-GB', { maximumFractionDigits: digits })
    .format(Math.round(n * f) / f)
    .replace(/,/g, ' ');
}

/** Unit labels and limits of the fields typed in the user's units. */
export function unitLabels(units: UnitSystem) {
  const imperial = units === 'imperial';
  return {
    mass: imperial ? 'lb' : 'kg',
    distance: imperial ? 'NM' : 'km',
    altitude: imperial ? 'ft' : 'm',
    fuelMin: imperial ? Math.ceil((SCREENING_LIMITS.minFuelKg / KG_PER_LB) * 10) / 10 : SCREENING_LIMITS.minFuelKg,
    fuelMax: imperial ? Math.floor(SCREENING_LIMITS.maxFuelKg / KG_PER_LB) : SCREENING_LIMITS.maxFuelKg,
    stepMax: imperial ? Math.floor(SCREENING_LIMITS.maxStepFromKm / KM_PER_NM) : SCREENING_LIMITS.maxStepFromKm,
    tropopauseMin: imperial
      ? Math.ceil(SCREENING_LIMITS.minTropopauseAltitudeM / M_PER_FT)
      : SCREENING_LIMITS.minTropopauseAltitudeM,
    tropopauseMax: imperial
      ? Math.floor(SCREENING_LIMITS.maxTropopauseAltitudeM / M_PER_FT)
      : SCREENING_LIMITS.maxTropopauseAltitudeM,
  };
}

export interface PastedPoints {
  points: { lat: number; lon: number }[];
  problems: { line: number; message: string }[];
}

const HEMI = /^([NSEW])?\s*([+-]?\d+(?:[.,]\d+)?)\s*([NSEW])?$/i;

function readCoordinate(token: string): Coordinate | null {
  const m = HEMI.exec(token.trim());
  if (!m) return null;
  if (m[1] && m[3]) return null;
  const value = Number(m[2].replace(',', '.'));
  if (!Number.isFinite(value)) return null;
  return { value, hemi: (m[1] ?? m[3] ?? '').toUpperCase() || null };
}

type Coordinate = { value: number; hemi: string | null };

/** Degrees, minutes and seconds as numbers ("60 12 30", "60 12.5", "60.2"): minutes and seconds below 60, only the last part with decimals. */
function readSexagesimal(text: string): number | 'bad-minutes' | null {
  const parts = text
    .trim()
    .split(/[\s:]+/)
    .filter((p) => p !== '');
  if (parts.length < 1 || parts.length > 3) return null;
  let total = 0;
  for (let i = 0; i < parts.length; i++) {
    const last = i === parts.length - 1;
    const ok = last ? /^\d+(?:[.,]\d+)?$/.test(parts[i]) : /^\d+$/.test(parts[i]);
    if (!ok) return null;
    const n = Number(parts[i].replace(',', '.'));
    if (i > 0 && n >= 60) return 'bad-minutes';
    total += n / 60 ** i;
  }
  return total;
}

/** One coordinate in degrees-minutes(-seconds), with an optional sign or a hemisphere letter before or after. */
function readSexagesimalCoordinate(token: string): Coordinate | 'bad-minutes' | null {
  const cleaned = token
    .replace(/[°º'′"″]/g, ' ')
    .trim()
    .replace(/[,;]$/, '')
    .trim();
  const m = /^([NSEW])?\s*([+-])?\s*([\d.,:\s]+?)\s*([NSEW])?$/i.exec(cleaned);
  if (!m || (m[1] && m[4]) || (m[2] && (m[1] || m[4]))) return null;
  const value = readSexagesimal(m[3]);
  if (value === null || value === 'bad-minutes') return value;
  return { value: m[2] === '-' ? -value : value, hemi: (m[1] ?? m[4] ?? '').toUpperCase() || null };
}

const ICAO_COMPACT = /^(\d{2})(\d{2})(\d{2})?([NS])\s*(\d{3})(\d{2})(\d{2})?([EW])$/i;

/**
 * The sexagesimal ways planners copy a point: the compact flight-plan form ("6012N01105E",
 * "601230N0110545E"), degrees and minutes ("60 12.5N 011 05.3E", "N60 12.5 E011 05.3") and degrees,
 * minutes and seconds ("60°12'30\"N 11°05'45\"E"). Null when the line is none of these.
 */
function readSexagesimalPoint(line: string): [Coordinate, Coordinate] | 'bad-minutes' | null {
  const compact = ICAO_COMPACT.exec(line.replace(/\s+/g, ''));
  if (compact) {
    const [, latD, latM, latS, latH, lonD, lonM, lonS, lonH] = compact;
    if (Number(latM) >= 60 || Number(lonM) >= 60 || Number(latS ?? 0) >= 60 || Number(lonS ?? 0) >= 60)
      return 'bad-minutes';
    const lat = Number(latD) + Number(latM) / 60 + Number(latS ?? 0) / 3600;
    const lon = Number(lonD) + Number(lonM) / 60 + Number(lonS ?? 0) / 3600;
    return [
      { value: lat, hemi: latH.toUpperCase() },
      { value: lon, hemi: lonH.toUpperCase() },
    ];
  }
  let halves: [string, string] | null = null;
  const degreeMarks = [...line.matchAll(/[+-]?\d+(?:[.,]\d+)?\s*[°º]/g)];
  if (degreeMarks.length === 2 && degreeMarks[1].index !== undefined) {
    let first = line.slice(0, degreeMarks[1].index).trim();
    let second = line.slice(degreeMarks[1].index);
    // "N 60°12.5' W 011°05.3'": the letter before the second number starts the second coordinate.
    const lead = /^[NSEW]/i.test(first) ? /\s*([NSEW])$/i.exec(first) : null;
    if (lead) {
      first = first.slice(0, lead.index);
      second = `${lead[1]}${second}`;
    }
    halves = [first, second];
  } else {
    // Letters mark where each coordinate ends (or starts): "60 12.5N 011 05.3E", "N60 12.5 E011 05.3".
    const suffix = /^([\d.,:\s]+?[NS])[\s,;]*([\d.,:\s]+?[EW])$/i.exec(line);
    const prefix = /^([NS][\d.,:\s]+?)[\s,;]*([EW][\d.,:\s]+)$/i.exec(line);
    const found = suffix ?? prefix;
    if (found && /\d\s+\d/.test(line)) halves = [found[1], found[2]];
  }
  if (!halves) return null;
  const a = readSexagesimalCoordinate(halves[0]);
  const b = readSexagesimalCoordinate(halves[1]);
  if (a === 'bad-minutes' || b === 'bad-minutes') return 'bad-minutes';
  if (!a || !b) return null;
  return [a, b];
}

/**
 * Parses a pasted list of points, one per line, latitude first: decimal degrees ("51.47 -0.45",
 * "51.47,-0.45", "51.47;-0.45", tab-separated, or with hemisphere letters "51.47N 0.45W",
 * "N51.47 W0.45"), the compact flight-plan form ("6012N01105E", "601230N0110545E"), degrees and
 * minutes ("60 12.5N 011 05.3E") and degrees, minutes and seconds ("60°12'30\"N 11°05'45\"E").
 * Blank lines and lines starting with # are skipped; every other line is a point or a problem.
 */
export function parseWaypointList(text: string): PastedPoints {
  const points: { lat: number; lon: number }[] = [];
  const problems: { line: number; message: string }[] = [];
  const lines = text.split(/\r\n|\r|\n/);
  lines.forEach((raw, i) => {
    const line = raw.trim();
    const n = i + 1;
    if (line === '' || line.startsWith('#')) return;
    let a: Coordinate | null;
    let b: Coordinate | null;
    const sexagesimal = readSexagesimalPoint(line);
    if (sexagesimal === 'bad-minutes') {
      problems.push({ line: n, message: `Line ${n}: minutes and seconds must be below 60 in "${line}".` });
      return;
    }
    if (sexagesimal) [a, b] = sexagesimal;
    else {
      let parts: string[];
      if (/[;\t]/.test(line)) parts = line.split(/[;\t]/);
      else if (line.split(',').length === 2) parts = line.split(',');
      else parts = line.split(/\s+/);
      parts = parts.map((p) => p.trim()).filter((p) => p !== '');
      if (parts.length !== 2) {
        problems.push({
          line: n,
          message: `Line ${n}: give a latitude and a longitude, such as "51.47 -0.45" or "6012N01105E".`,
        });
        return;
      }
      a = readCoordinate(parts[0]);
      b = readCoordinate(parts[1]);
    }
    if (!a || !b) {
      problems.push({ line: n, message: `Line ${n}: "${line}" is not a latitude and a longitude in degrees.` });
      return;
    }
    if ((a.hemi === 'E' || a.hemi === 'W') && (b.hemi === 'N' || b.hemi === 'S')) {
      problems.push({ line: n, message: `Line ${n}: put the latitude first, then the longitude.` });
      return;
    }
    if ((a.hemi && a.hemi !== 'N' && a.hemi !== 'S') || (b.hemi && b.hemi !== 'E' && b.hemi !== 'W')) {
      problems.push({ line: n, message: `Line ${n}: the latitude takes N or S, the longitude E or W.` });
      return;
    }
    const lat = a.hemi === 'S' ? -Math.abs(a.value) : a.hemi === 'N' ? Math.abs(a.value) : a.value;
    const lon = b.hemi === 'W' ? -Math.abs(b.value) : b.hemi === 'E' ? Math.abs(b.value) : b.value;
    if (lat < -90 || lat > 90) {
      problems.push({ line: n, message: `Line ${n}: the latitude ${a.value} is outside -90 to 90 degrees.` });
      return;
    }
    if (lon < -180 || lon > 180) {
      problems.push({ line: n, message: `Line ${n}: the longitude ${b.value} is outside -180 to 180 degrees.` });
      return;
    }
    points.push({ lat, lon });
  });
  if (points.length === 0 && problems.length === 0) {
    problems.push({ line: 0, message: 'Paste at least two points, one per line.' });
  }
  return { points, problems };
}

/** Where an engine-input path (as the API reports it) sits in the form, given the form's modes. */
export function formPathFor(
  serverPath: string,
  values: Pick<ScreenFormValues, 'routeMode' | 'cruiseMode' | 'emissionMode' | 'tropopauseMode'>,
): string | null {
  const p = serverPath.split('.');
  switch (p[0]) {
    case 'name':
      return 'name';
    case 'route': {
      if (p[1] === 'flightPlan') return p[2] === 'from' || p[2] === 'to' ? `flightPlan.${p[2]}` : 'flightPlan.text';
      if (p[1] !== 'waypoints' || p[2] === undefined || !/^\d+$/.test(p[2])) return 'route';
      if (values.routeMode === 'airports') return `airports.${p[2]}.code`;
      return p[3] === 'lon' ? `points.${p[2]}.lon` : `points.${p[2]}.lat`;
    }
    case 'cruise':
      if (values.cruiseMode === 'level') return 'flightLevel';
      if (p[1] === 'steps' && p[2] !== undefined && /^\d+$/.test(p[2])) {
        return p[3] === 'flightLevel' ? `steps.${p[2]}.flightLevel` : `steps.${p[2]}.from`;
      }
      return 'steps';
    case 'fuelBurnKg':
      return 'fuelBurn';
    case 'aircraft':
      return 'aircraft';
    case 'emission':
      if (values.emissionMode === 'direct') return 'eiNox';
      if (values.emissionMode === 'engine') {
        if (p[1] === 'engineCount') return 'engineCount';
        if (p[1] === 'mach') return 'mach';
        return 'engineId';
      }
      return p[1] === 'mach' ? 'mach' : 'aircraft';
    case 'mach':
      return 'mach';
    case 'month':
      return 'month';
    case 'flightDate':
      return 'flightDate';
    case 'tropopause':
      if (values.tropopauseMode === 'altitude') return 'tropopauseAltitude';
      if (values.tropopauseMode === 'pressure') return 'tropopausePressure';
      if (values.tropopauseMode === 'sounding') return 'soundingId';
      return null;
    case 'assumptions': {
      const key = p[1];
      if ((BAND_KEYS as readonly string[]).includes(key)) {
        const part = p[2];
        return `assumptions.${key}.${part === 'low' || part === 'high' ? part : 'central'}`;
      }
      if (key === 'ohCm3' || key === 'ho2Cm3' || key === 'relativeHumidity' || key === 'ozoneProfile')
        return `assumptions.${key}`;
      return null;
    }
    default:
      return null;
  }
}

/** Reads typed numbers for one form, collecting the problems by form path. */
interface FormReader {
  add(path: string, message: string): void;
  /** A number that must be there: a problem naming `label` when empty or not a number. */
  need(path: string, text: string, label: string): number | undefined;
  /** A number that may be left empty. */
  optional(path: string, text: string, label: string): number | undefined;
}

function formReader(problems: FormProblem[]): FormReader {
  const add = (path: string, message: string) => problems.push({ path, message });
  const need = (path: string, text: string, label: string): number | undefined => {
    if (text.trim() === '') {
      add(path, `Enter ${label}.`);
      return undefined;
    }
    const n = readNumber(text);
    if (n === null) {
      add(path, `${label[0].toUpperCase()}${label.slice(1)} must be a number.`);
      return undefined;
    }
    return n;
  };
  const optional = (path: string, text: string, label: string): number | undefined =>
    text.trim() === '' ? undefined : need(path, text, label);
  return { add, need, optional };
}

function routeBody(values: ScreenFormValues, r: FormReader, body: ScreeningRequestBody): void {
  if (values.routeMode === 'airports') {
    body.route = {
      waypoints: values.airports.map((a, i) => {
        const code = a.code.trim().toUpperCase();
        if (code === '')
          r.add(
            `airports.${i}.code`,
            i === 0
              ? 'Enter the departure airport.'
              : i === values.airports.length - 1
                ? 'Enter the destination airport.'
                : 'Enter this stop, or remove it.',
          );
        return { airport: code };
      }),
    };
  } else if (values.routeMode === 'flightPlan') {
    const fp = values.flightPlan;
    if (fp.text.trim() === '')
      r.add(
        'flightPlan.text',
        'Paste the route of the flight plan (item 15), such as N0480F350 DCT 62N020W 63N030W DCT.',
      );
    if (fp.from.trim() === '') r.add('flightPlan.from', 'Enter the departure aerodrome.');
    if (fp.to.trim() === '') r.add('flightPlan.to', 'Enter the destination aerodrome.');
    body.route = {
      flightPlan: { text: fp.text.trim(), from: fp.from.trim().toUpperCase(), to: fp.to.trim().toUpperCase() },
    };
  } else {
    body.route = {
      waypoints: values.points.map((pt, i) => ({
        lat: r.need(`points.${i}.lat`, pt.lat, 'the latitude') ?? Number.NaN,
        lon: r.need(`points.${i}.lon`, pt.lon, 'the longitude') ?? Number.NaN,
      })),
    };
  }
}

function cruiseBody(values: ScreenFormValues, ctx: ScreenFormContext, r: FormReader, body: ScreeningRequestBody): void {
  const u = unitLabels(ctx.units);
  if (values.cruiseMode === 'level') {
    body.cruise = { flightLevel: r.need('flightLevel', values.flightLevel, 'a flight level') ?? Number.NaN };
  } else {
    body.cruise = {
      steps: values.steps.map((s, i): StepBody => {
        let fromKm = 0;
        const at = i > 0 && s.at ? Number(s.at) : null;
        if (at !== null)
          return {
            atWaypoint: at,
            flightLevel: r.need(`steps.${i}.flightLevel`, s.flightLevel, 'a flight level') ?? Number.NaN,
          };
        if (i > 0) {
          const from = r.need(
            `steps.${i}.from`,
            s.from,
            `where this step climb starts, in ${u.distance} from departure`,
          );
          if (from !== undefined && (from < 0 || from > u.stepMax))
            r.add(
              `steps.${i}.from`,
              `A step must start between 0 and ${plain(u.stepMax)} ${u.distance} along the route.`,
            );
          fromKm = from === undefined ? Number.NaN : distanceToKm(from, ctx.units);
        }
        return { fromKm, flightLevel: r.need(`steps.${i}.flightLevel`, s.flightLevel, 'a flight level') ?? Number.NaN };
      }),
    };
  }
}

function emissionBody(
  values: ScreenFormValues,
  ctx: ScreenFormContext,
  r: FormReader,
  body: ScreeningRequestBody,
  mach: number | undefined,
): void {
  if (values.emissionMode === 'aircraft') {
    const code = values.aircraft.trim();
    if (!code) r.add('aircraft', 'Choose an aircraft type, or give the EI NOx directly.');
    else {
      body.aircraft = code;
      const type = ctx.aircraft.find((a) => a.code === code);
      if (type?.emission) {
        if ('engine' in type.emission) {
          body.emission = {
            ...type.emission,
            method: values.method,
            mach: mach ?? type.emission.mach ?? type.typicalMach,
          };
        } else body.emission = type.emission;
      }
    }
  } else if (values.emissionMode === 'engine') {
    const engine = ctx.engines.find((e) => String(e.id) === values.engineId);
    if (!engine) r.add('engineId', 'Choose an engine, or give the EI NOx directly.');
    const count = r.need('engineCount', values.engineCount, 'the number of engines');
    body.emission = {
      engine: engine
        ? { fuelFlowKgS: engine.fuelFlowKgS, eiNoxGPerKg: engine.eiNoxGPerKg }
        : {
            fuelFlowKgS: [Number.NaN, Number.NaN, Number.NaN, Number.NaN],
            eiNoxGPerKg: [Number.NaN, Number.NaN, Number.NaN, Number.NaN],
          },
      engineCount: count ?? Number.NaN,
      method: values.method,
      ...(mach !== undefined ? { mach } : {}),
    };
  } else {
    body.emission = {
      eiNoxGPerKg: r.need('eiNox', values.eiNox, 'the cruise EI NOx in g per kg of fuel') ?? Number.NaN,
    };
  }
}

function tropopauseBody(
  values: ScreenFormValues,
  ctx: ScreenFormContext,
  r: FormReader,
  body: ScreeningRequestBody,
): void {
  const u = unitLabels(ctx.units);
  if (values.tropopauseMode === 'altitude') {
    const alt = r.need('tropopauseAltitude', values.tropopauseAltitude, `the tropopause altitude in ${u.altitude}`);
    if (alt !== undefined && (alt < u.tropopauseMin || alt > u.tropopauseMax)) {
      r.add(
        'tropopauseAltitude',
        `The tropopause altitude must be between ${plain(u.tropopauseMin)} and ${plain(u.tropopauseMax)} ${u.altitude}.`,
      );
    }
    body.tropopause = { altitudeM: alt === undefined ? Number.NaN : altitudeToM(alt, ctx.units) };
  } else if (values.tropopauseMode === 'pressure') {
    body.tropopause = {
      pressureHpa:
        r.need('tropopausePressure', values.tropopausePressure, 'the tropopause pressure in hPa') ?? Number.NaN,
    };
  } else if (values.tropopauseMode === 'sounding') {
    const s = ctx.soundings.find((x) => String(x.id) === values.soundingId);
    if (!s) r.add('soundingId', 'Choose a stored sounding, or use another tropopause.');
    else body.tropopause = { sounding: s.levels };
  }
}

function assumptionsBody(
  values: ScreenFormValues,
  ctx: ScreenFormContext,
  r: FormReader,
  body: ScreeningRequestBody,
): void {
  const a = values.assumptions;
  const assumptions: NonNullable<ScreeningInputRaw['assumptions']> = {};
  for (const key of BAND_KEYS) {
    const t = a[key];
    if (t.low.trim() === '' && t.central.trim() === '' && t.high.trim() === '') continue;
    const d = ctx.defaults[key];
    const part = (which: keyof BandText): number => {
      const text = t[which];
      if (text.trim() === '') return d[which];
      const n = readNumber(text);
      if (n === null) {
        r.add(`assumptions.${key}.${which}`, 'This must be a number, such as 4.5e-4.');
        return Number.NaN;
      }
      return n;
    };
    assumptions[key] = { low: part('low'), central: part('central'), high: part('high') };
  }
  const oh = r.optional('assumptions.ohCm3', a.ohCm3, 'the OH density');
  if (oh !== undefined) assumptions.ohCm3 = oh;
  const ho2 = r.optional('assumptions.ho2Cm3', a.ho2Cm3, 'the HO2 density');
  if (ho2 !== undefined) assumptions.ho2Cm3 = ho2;
  const rh = r.optional('assumptions.relativeHumidity', a.relativeHumidity, 'the relative humidity');
  if (rh !== undefined) {
    if (rh < 0 || rh > 100) r.add('assumptions.relativeHumidity', 'The relative humidity must be between 0 and 100 %.');
    assumptions.relativeHumidity = rh / 100;
  }
  if (a.ozoneProfile) {
    if ((OZONE_PROFILE_NAMES as readonly string[]).includes(a.ozoneProfile))
      assumptions.ozoneProfile = a.ozoneProfile as (typeof OZONE_PROFILE_NAMES)[number];
    else r.add('assumptions.ozoneProfile', 'Choose one of the listed ozone profiles.');
  }
  if (Object.keys(assumptions).length > 0) body.assumptions = assumptions;
}

/** The form's values as the engine input: numbers parsed, units converted, modes resolved. */
export function buildScreeningBody(
  values: ScreenFormValues,
  ctx: ScreenFormContext,
): { body: ScreeningRequestBody; problems: FormProblem[] } {
  const problems: FormProblem[] = [];
  const r = formReader(problems);
  const u = unitLabels(ctx.units);
  const body: ScreeningRequestBody = {};
  const name = values.name.trim();
  if (name) body.name = name;
  routeBody(values, r, body);
  cruiseBody(values, ctx, r, body);

  const fuel = r.need('fuelBurn', values.fuelBurn, `the cruise fuel burn in ${u.mass}`);
  if (fuel !== undefined && (fuel < u.fuelMin || fuel > u.fuelMax))
    r.add('fuelBurn', `The fuel burn must be between ${plain(u.fuelMin, 1)} and ${plain(u.fuelMax)} ${u.mass}.`);
  body.fuelBurnKg = fuel === undefined ? Number.NaN : fuelToKg(fuel, ctx.units);

  const mach = r.optional('mach', values.mach, 'the cruise Mach');
  if (mach !== undefined) body.mach = mach;
  emissionBody(values, ctx, r, body, mach);

  if (values.flightDate.trim()) body.flightDate = values.flightDate.trim();
  if (values.month) {
    const m = readNumber(values.month);
    body.month = m ?? Number.NaN;
  }
  tropopauseBody(values, ctx, r, body);
  assumptionsBody(values, ctx, r, body);
  return { body, problems };
}

const engineInputWithoutEmission = screeningInputSchema.omit({ emission: true });

/**
 * Everything wrong with the form, by form path: the form's own reading of numbers and units, then
 * the engine schema's checks mapped back to the fields (one message per field).
 */
export function screenFormProblems(
  values: ScreenFormValues,
  ctx: ScreenFormContext,
): { body: ScreeningRequestBody; problems: FormProblem[] } {
  const { body, problems } = buildScreeningBody(values, ctx);
  const seen = new Set(problems.map((p) => p.path));
  const { aircraft: _aircraft, name: _name, ...requested } = body;
  // A step at a waypoint gets its distance on the server (the route's airports are resolved there);
  // here it stands just after the step before it, so the other checks still run.
  let previousKm = 0;
  const engine = {
    ...requested,
    cruise:
      requested.cruise && 'steps' in requested.cruise
        ? {
            steps: requested.cruise.steps.map((st) => {
              previousKm = 'atWaypoint' in st ? previousKm + 0.001 : st.fromKm;
              return { fromKm: previousKm, flightLevel: st.flightLevel };
            }),
          }
        : requested.cruise,
  };
  const checked =
    engine.emission === undefined
      ? engineInputWithoutEmission.safeParse(engine)
      : screeningInputSchema.safeParse(engine);
  if (!checked.success) {
    for (const issue of checked.error.issues) {
      const path = formPathFor(issue.path.map(String).join('.'), values);
      if (path === null || seen.has(path)) continue;
      // The whole-cruise message adds nothing when a step's own field already says what is wrong (and
      // would stay behind once that field is fixed, since only the edited field is validated again).
      if (path === 'steps' && problems.some((p) => p.path.startsWith('steps.'))) continue;
      if (path === 'fuelBurn' || path === 'tropopauseAltitude' || /^steps\.\d+\.from$/.test(path)) {
        if (issue.code === 'too_small' || issue.code === 'too_big' || issue.code === 'invalid_type') continue;
      }
      seen.add(path);
      problems.push({ path, message: issue.message });
    }
  }
  return { body, problems };
}

const bandText = z.object({ low: z.string(), central: z.string(), high: z.string() });

const screenFormShape = z.object({
  name: z.string().max(160, { error: 'Use at most 160 characters for the name.' }),
  routeMode: z.enum(ROUTE_MODES),
  airports: z.array(z.object({ code: z.string() })),
  points: z.array(z.object({ lat: z.string(), lon: z.string() })),
  flightPlan: z.object({ text: z.string(), from: z.string(), to: z.string() }),
  cruiseMode: z.enum(CRUISE_MODES),
  flightLevel: z.string(),
  steps: z.array(z.object({ from: z.string(), flightLevel: z.string(), at: z.string().optional() })),
  fuelBurn: z.string(),
  emissionMode: z.enum(EMISSION_MODES),
  aircraft: z.string(),
  engineId: z.string(),
  engineCount: z.string(),
  method: z.enum(['bffm2', 'dlr']),
  eiNox: z.string(),
  mach: z.string(),
  flightDate: z.string(),
  month: z.string(),
  tropopauseMode: z.enum(TROPOPAUSE_MODES),
  tropopauseAltitude: z.string(),
  tropopausePressure: z.string(),
  soundingId: z.string(),
  assumptions: z.object({
    jO3NoonPerS: bandText,
    jNo2NoonPerS: bandText,
    daylightFactor: bandText,
    noxToNoyFraction: bandText,
    ohCm3: z.string(),
    ho2Cm3: z.string(),
    relativeHumidity: z.string(),
    ozoneProfile: z.string(),
  }),
});

function toPathKey(segment: string): string | number {
  return /^\d+$/.test(segment) ? Number(segment) : segment;
}

/** The form's zod schema (for `zodResolver`): its text fields, then every engine check by field. */
export function screenFormSchema(ctx: ScreenFormContext) {
  return screenFormShape.superRefine((values, zctx) => {
    for (const p of screenFormProblems(values, ctx).problems) {
      zctx.addIssue({ code: 'custom', path: p.path.split('.').map(toPathKey), message: p.message });
    }
  });
}

/** Field paths the form shows errors beside (server problems elsewhere become a general message). */
export function isFormPath(path: string): boolean {
  return (
    /^(name|fuelBurn|flightLevel|aircraft|engineId|engineCount|eiNox|mach|flightDate|month|tropopauseAltitude|tropopausePressure|soundingId|steps|route)$/.test(
      path,
    ) ||
    /^airports\.\d+\.code$/.test(path) ||
    /^points\.\d+\.(lat|lon)$/.test(path) ||
    /^flightPlan\.(text|from|to)$/.test(path) ||
    /^steps\.\d+\.(from|flightLevel)$/.test(path) ||
    /^assumptions\.(jO3NoonPerS|jNo2NoonPerS|daylightFactor|noxToNoyFraction)\.(low|central|high)$/.test(path) ||
    /^assumptions\.(ohCm3|ho2Cm3|relativeHumidity|ozoneProfile)$/.test(path)
  );
}
