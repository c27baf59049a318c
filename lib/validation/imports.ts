import { z } from 'zod';
import { SCREENING_LIMITS } from './screening';
import type { LineProblem } from './problems';

/**
 * Flight-schedule imports (DESIGN.md "Import formats"): the file limits, the columns with their
 * documentation (the imports page and the template read the same list), the schema of one CSV row and
 * the query strings of the import and flight lists. Client-safe.
 */
export const IMPORT_LIMITS = {
  /** 10 MB of CSV. */
  maxBytes: 10 * 1024 * 1024,
  /** Data rows, not counting the header. */
  maxRows: 100_000,
  /** A refusal lists at most this many problems (it says how many there were). */
  maxProblemsListed: 1000,
} as const;

export const SCHEDULE_REQUIRED_COLUMNS = [
  'date',
  'flight',
  'origin',
  'destination',
  'aircraft',
  'cruise_fl',
  'fuel_kg',
] as const;
export const SCHEDULE_OPTIONAL_COLUMNS = ['steps', 'fleet', 'ei_nox_g_per_kg', 'mach', 'route'] as const;
export const SCHEDULE_COLUMNS = [...SCHEDULE_REQUIRED_COLUMNS, ...SCHEDULE_OPTIONAL_COLUMNS] as const;
export type ScheduleColumn = (typeof SCHEDULE_COLUMNS)[number];

export interface ScheduleColumnDoc {
  name: ScheduleColumn;
  required: boolean;
  unit: string;
  description: string;
  example: string;
}

export const SCHEDULE_COLUMN_DOCS: readonly ScheduleColumnDoc[] = [
  { name: 'date', required: true, unit: 'YYYY-MM-DD, UTC', description: 'Date of departure.', example: '2026-11-03' },
  {
    name: 'flight',
    required: true,
    unit: 'up to 16 characters',
    description: 'Flight number or other designator.',
    example: 'SKP401',
  },
  {
    name: 'origin',
    required: true,
    unit: 'ICAO or IATA code',
    description: 'Departure airport; stored as its ICAO code.',
    example: 'EFHK',
  },
  {
    name: 'destination',
    required: true,
    unit: 'ICAO or IATA code',
    description: 'Arrival airport; the route is the great circle between the two.',
    example: 'RJAA',
  },
  {
    name: 'aircraft',
    required: true,
    unit: 'type code',
    description:
      'An aircraft type of this workspace (Engines & aircraft); it supplies the EI NOx and the typical Mach.',
    example: 'SK-LR1',
  },
  {
    name: 'cruise_fl',
    required: true,
    unit: 'flight level, 0-660',
    description: 'Cruise flight level, whole number; “FL” in front is accepted. May be left empty when steps is given.',
    example: '370',
  },
  {
    name: 'fuel_kg',
    required: true,
    unit: 'kg',
    description: 'Fuel burned along the route at cruise (not the LTO cycle).',
    example: '61250',
  },
  {
    name: 'steps',
    required: false,
    unit: 'FL@km pairs',
    description:
      'Step climb: flight level@km along the route, separated by spaces, the first at 0 km. Replaces cruise_fl.',
    example: '350@0 370@2600 390@5200',
  },
  {
    name: 'fleet',
    required: false,
    unit: 'fleet name',
    description: 'A fleet of this workspace; empty means the aircraft type’s default fleet.',
    example: 'Polar long-haul A',
  },
  {
    name: 'ei_nox_g_per_kg',
    required: false,
    unit: 'g NO2 per kg fuel',
    description: 'Measured cruise EI NOx for this flight; replaces the aircraft type’s engine data.',
    example: '14.2',
  },
  {
    name: 'mach',
    required: false,
    unit: 'Mach number',
    description: 'Cruise Mach for timing; empty means the aircraft type’s typical Mach.',
    example: '0.85',
  },
  {
    name: 'route',
    required: false,
    unit: 'ICAO flight-plan route (item 15), quoted',
    description:
      'The filed route between origin and destination, flown instead of the great circle; named points and airways come from the Fixes & airways library. Its levels replace cruise_fl and steps.',
    example: '"N0480F350 DCT 6230N02000W 6500N03000W DCT"',
  },
];

/** One problem of an import: the CSV line (the header is line 1), the column, and what to fix. */
export type ImportProblem = LineProblem;

const DATE_RE = /^\d{4}-\d{2}-\d{2}$/;
const NUMBER_RE = /^[+]?(\d+(\.\d*)?|\.\d+)$/;
const FL_RE = /^(?:FL)?\s*(\d{1,3})$/i;
const STEP_RE = /^(?:FL)?(\d{1,3})@(\d+(?:\.\d+)?)$/i;

function isRealDate(s: string): boolean {
  const y = Number(s.slice(0, 4));
  const m = Number(s.slice(5, 7));
  const d = Number(s.slice(8, 10));
  if (y < 1900 || y > 2200) return false;
  const t = new Date(Date.UTC(y, m - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
}

const text = (max: number, missing: string, tooLong: string) =>
  z.string({ error: missing }).min(1, { error: missing }).max(max, { error: tooLong });

const decimal = (message: string) =>
  z
    .string({ error: message })
    .regex(NUMBER_RE, { error: message })
    .transform((s) => Number(s));

const airport = (label: string) =>
  z
    .string({ error: `Give the ${label} airport as an ICAO (EGLL) or IATA (LHR) code.` })
    .regex(/^[A-Za-z0-9]{3,4}$/, { error: `Give the ${label} airport as an ICAO (EGLL) or IATA (LHR) code.` })
    .transform((s) => s.toUpperCase());

const flightLevel = z
  .string()
  .regex(FL_RE, { error: 'Write the cruise level as a whole flight level, such as 370 or FL370.' })
  .transform((s) => Number(FL_RE.exec(s)?.[1]))
  .refine((fl) => fl >= SCREENING_LIMITS.minFlightLevel && fl <= SCREENING_LIMITS.maxFlightLevel, {
    error: `The flight level must be between ${SCREENING_LIMITS.minFlightLevel} and ${SCREENING_LIMITS.maxFlightLevel}.`,
  });

const STEPS_HELP = 'Write steps as flight level@km pairs separated by spaces, such as 350@0 390@2100.';

const steps = z.string().transform((s, ctx) => {
  const out: { fromKm: number; flightLevel: number }[] = [];
  for (const token of s.split(/\s+/).filter(Boolean)) {
    const m = STEP_RE.exec(token);
    if (!m) {
      ctx.addIssue({ code: 'custom', message: `“${token.slice(0, 20)}” is not a step. ${STEPS_HELP}` });
      return z.NEVER;
    }
    out.push({ flightLevel: Number(m[1]), fromKm: Number(m[2]) });
  }
  return out;
});

/**
 * One data row of a schedule CSV, as trimmed cells (an empty cell is absent). Its output is typed;
 * what depends on the workspace (aircraft, fleet, airports, flights already present) and on the
 * screening input rules is checked afterwards. Issue paths are the CSV column names.
 */
export const scheduleRowSchema = z
  .object({
    date: z
      .string({ error: 'Give the date as YYYY-MM-DD (UTC).' })
      .regex(DATE_RE, { error: 'Write the date as YYYY-MM-DD (UTC), such as 2026-11-03.', abort: true })
      .refine(isRealDate, { error: 'This date does not exist in the calendar.' }),
    flight: text(16, 'Give the flight number.', 'A flight number has at most 16 characters.').transform((s) =>
      s.toUpperCase(),
    ),
    origin: airport('origin'),
    destination: airport('destination'),
    aircraft: text(
      16,
      'Give the aircraft type code, such as SK-LR1.',
      'An aircraft type code has at most 16 characters.',
    ).transform((s) => s.toUpperCase()),
    cruise_fl: flightLevel.optional(),
    fuel_kg: decimal('Give the cruise fuel burn in kg as a number, such as 61250.'),
    steps: steps.optional(),
    fleet: z.string().max(80, { error: 'A fleet name has at most 80 characters.' }).optional(),
    ei_nox_g_per_kg: decimal('Give the EI NOx in g/kg as a number, such as 14.2.').optional(),
    mach: decimal('Give the Mach number as a number, such as 0.85.').optional(),
    route: z
      .string()
      .max(SCREENING_LIMITS.maxFlightPlanChars, {
        error: `A route has at most ${SCREENING_LIMITS.maxFlightPlanChars} characters.`,
      })
      .optional(),
  })
  .superRefine((row, ctx) => {
    if (row.cruise_fl === undefined && (row.steps === undefined || row.steps.length === 0)) {
      ctx.addIssue({
        code: 'custom',
        path: ['cruise_fl'],
        message: 'Give the cruise flight level, or a step climb in steps.',
      });
    }
  });

export type ScheduleRow = z.output<typeof scheduleRowSchema>;

/** Trimmed cells of one CSV row by column; empty cells are left out. */
export type ScheduleCells = Partial<Record<ScheduleColumn, string>>;

const day = z
  .string()
  .regex(DATE_RE, { error: 'Use a date as YYYY-MM-DD.', abort: true })
  .refine(isRealDate, { error: 'This date does not exist in the calendar.' });
const positiveId = (what: string) =>
  z.coerce
    .number({ error: `The ${what} must be a number.` })
    .int({ error: `The ${what} must be a whole number.` })
    .positive({ error: `The ${what} must be a whole number.` });
const emptyToUndefined = (v: unknown) => (v === '' ? undefined : v);

/** Query string of `GET .../flights` (and the filters of the flights page). */
export const flightListQuerySchema = z
  .object({
    import: z.preprocess(emptyToUndefined, positiveId('import id').optional()),
    from: z.preprocess(emptyToUndefined, day.optional()),
    to: z.preprocess(emptyToUndefined, day.optional()),
    fleet: z.preprocess(emptyToUndefined, positiveId('fleet id').optional()),
    basis: z.preprocess(
      emptyToUndefined,
      z.enum(['planned', 'flown'], { error: 'The basis is planned or flown.' }).optional(),
    ),
    aircraft: z.preprocess(
      emptyToUndefined,
      z.string().trim().max(16, { error: 'An aircraft type code has at most 16 characters.' }).optional(),
    ),
    cursor: z.preprocess(
      emptyToUndefined,
      z
        .string()
        .regex(/^\d{4}-\d{2}-\d{2}~\d{1,12}$/, { error: 'The cursor must come from nextCursor of a previous page.' })
        .optional(),
    ),
    limit: z.preprocess(
      emptyToUndefined,
      z.coerce
        .number({ error: 'The limit must be a number.' })
        .int()
        .min(1, { error: 'The limit is 1-200.' })
        .max(200, { error: 'The limit is 1-200.' })
        .optional(),
    ),
  })
  .superRefine((q, ctx) => {
    if (q.from && q.to && q.from > q.to)
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end date is before the start date.' });
  });

export type FlightListQuery = z.output<typeof flightListQuerySchema>;

/** Query string of `GET .../imports`. */
export const importListQuerySchema = z.object({
  cursor: z.preprocess(emptyToUndefined, positiveId('cursor').optional()),
  limit: z.preprocess(
    emptyToUndefined,
    z.coerce
      .number({ error: 'The limit must be a number.' })
      .int()
      .min(1, { error: 'The limit is 1-100.' })
      .max(100, { error: 'The limit is 1-100.' })
      .optional(),
  ),
});

export const IMPORT_STATUSES = ['queued', 'screening', 'complete', 'failed'] as const;
export type ImportStatus = (typeof IMPORT_STATUSES)[number];
