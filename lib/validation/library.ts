import { z } from 'zod';
import { engineCertSchema, SCREENING_LIMITS, soundingSchema, waypointSchema } from './screening';
import { hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE } from './display-text';

/**
 * Schemas of the planner's library: saved routes, engines, aircraft types and soundings. The same
 * schemas serve the forms (zodResolver), the server actions and the /api/v1 handlers. Client-safe.
 */

const text = (label: string, max: number) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(max, { error: `${label} may have at most ${max} characters.` });

const requiredText = (label: string, max: number) =>
  text(label, max)
    .min(1, { error: `Give ${label.toLowerCase()}.` })
    .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE);

const numberIn = (label: string, min: number, max: number, unit = '') => {
  const message = `${label} must be between ${min} and ${max}${unit ? ` ${unit}` : ''}.`;
  return z
    .number({
      error: (i: { input?: unknown }) =>
        i.input === undefined ? `${label} is required.` : `${label} must be a number.`,
    })
    .min(min, { error: message })
    .max(max, { error: message });
};

const wholeIn = (label: string, min: number, max: number, unit = '') =>
  numberIn(label, min, max, unit).int({ error: `${label} must be a whole number.` });

const idRef = (label: string) =>
  z
    .number({ error: `${label} must be chosen from the list.` })
    .int({ error: `${label} must be chosen from the list.` })
    .positive({ error: `${label} must be chosen from the list.` })
    .nullable();

// ---------------------------------------------------------------------------------------------
// Saved routes

export const ROUTE_NAME_MAX = 120;
export const ROUTE_NOTES_MAX = 2000;

/** A saved route: a name unique in the workspace, 2-500 waypoints (airport codes or lat/lon), notes. */
export const routeSaveSchema = z.strictObject({
  name: requiredText('A route name', ROUTE_NAME_MAX),
  waypoints: z
    .array(waypointSchema, { error: 'The waypoints must be a list of { airport } or { lat, lon }.' })
    .min(SCREENING_LIMITS.minWaypoints, { error: 'A route needs at least 2 waypoints.' })
    .max(SCREENING_LIMITS.maxWaypoints, {
      error: `A route may have at most ${SCREENING_LIMITS.maxWaypoints} waypoints.`,
    }),
  notes: text('The notes', ROUTE_NOTES_MAX).default(''),
});
export type RouteSave = z.output<typeof routeSaveSchema>;

/** A partial update of a saved route (PATCH): any of name, waypoints, notes. */
export const routePatchSchema = routeSaveSchema.partial();
export type RoutePatch = z.output<typeof routePatchSchema>;

const COORDINATE_LINE = /^([+-]?\d+(?:\.\d+)?)\s*[,;\s]\s*([+-]?\d+(?:\.\d+)?)$/;

/**
 * Reads the waypoint box of the route form: one waypoint per line (or several codes on a line,
 * separated by spaces or commas), each an airport code (EGLL, LHR) or "latitude, longitude" in
 * degrees, north and east positive. Blank lines are skipped.
 */
export function parseWaypointLines(value: string): unknown[] {
  const out: unknown[] = [];
  for (const rawLine of value.split(/\r?\n/)) {
    const line = rawLine.trim();
    if (!line) continue;
    const coordinate = COORDINATE_LINE.exec(line);
    if (coordinate) {
      out.push({ lat: Number(coordinate[1]), lon: Number(coordinate[2]) });
      continue;
    }
    for (const token of line.split(/[\s,;]+/).filter(Boolean)) out.push({ airport: token.toUpperCase() });
  }
  return out;
}

/** Writes waypoints back into the form's box, one per line. */
export function formatWaypointLines(
  waypoints: readonly ({ lat: number; lon: number } | { airport: string })[],
): string {
  return waypoints.map((w) => ('airport' in w ? w.airport : `${w.lat}, ${w.lon}`)).join('\n');
}

/** "Waypoint 3: ..." for problems of `waypoints.2.*`, so the box shows which line is wrong. */
export function waypointProblemMessage(path: string, message: string): string {
  const m = /^waypoints\.(\d+)/.exec(path);
  return m ? `Waypoint ${Number(m[1]) + 1}: ${message}` : message;
}

/** The route form: the waypoints typed into one box; its output is a `RouteSave`. */
export const routeFormSchema = z
  .object({
    name: z.string(),
    waypointsText: z.string({ error: 'List the waypoints.' }),
    notes: z.string().default(''),
  })
  .transform((form, ctx) => {
    const parsed = routeSaveSchema.safeParse({
      name: form.name,
      waypoints: parseWaypointLines(form.waypointsText),
      notes: form.notes,
    });
    if (parsed.success) return parsed.data;
    for (const issue of parsed.error.issues) {
      const path = issue.path.map(String).join('.');
      const field = path.startsWith('waypoints') ? 'waypointsText' : path.split('.')[0];
      ctx.addIssue({ code: 'custom', path: [field], message: waypointProblemMessage(path, issue.message) });
    }
    return z.NEVER;
  });
export type RouteForm = z.input<typeof routeFormSchema>;

// ---------------------------------------------------------------------------------------------
// Engines

export const ENGINE_NAME_MAX = 120;
export const ENGINE_SOURCE_MAX = 500;

/** The four ICAO LTO modes in the order every engine quad uses. */
export const LTO_MODES = [
  { key: 'idle', label: 'Idle', thrust: '7 %' },
  { key: 'approach', label: 'Approach', thrust: '30 %' },
  { key: 'climb_out', label: 'Climb-out', thrust: '85 %' },
  { key: 'take_off', label: 'Take-off', thrust: '100 %' },
] as const;

/**
 * An engine: a name unique in the workspace, the ICAO Annex 16 Vol II certification fuel flows
 * (kg/s per engine, positive, rising idle -> take-off) and EI NOx (g NO2/kg, above 0, at most 200)
 * in the mode order idle 7 %, approach 30 %, climb-out 85 %, take-off 100 %, and where the values
 * come from.
 */
export const engineSaveSchema = engineCertSchema.safeExtend({
  name: requiredText('An engine name', ENGINE_NAME_MAX),
  source: text('The source note', ENGINE_SOURCE_MAX).default(''),
});
export type EngineSave = z.output<typeof engineSaveSchema>;
export type EngineForm = z.input<typeof engineSaveSchema>;

// ---------------------------------------------------------------------------------------------
// Aircraft types

export const AIRCRAFT_CODE_MAX = 16;

/**
 * An aircraft type: a code unique in the workspace (stored in capitals), a name, either an engine
 * of the workspace (with an engine count 1-8) or a direct cruise EI NOx (g/kg, 0-200; for types
 * without certification data, such as a supersonic concept), typical Mach and cruise flight level,
 * and an optional default fleet.
 */
export const aircraftTypeSaveSchema = z
  .strictObject({
    code: z
      .string({ error: 'The type code must be text, such as SK-LR1.' })
      .trim()
      .min(1, { error: 'Give a type code, such as SK-LR1.' })
      .max(AIRCRAFT_CODE_MAX, { error: `A type code has at most ${AIRCRAFT_CODE_MAX} characters.` })
      .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, {
        error: 'A type code uses letters, digits and - . _ / only, such as SK-LR1.',
      })
      .transform((c) => c.toUpperCase()),
    name: text('The type name', 120).refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE).default(''),
    engineId: idRef('The engine').default(null),
    directEiGPerKg: numberIn('The direct EI NOx', 0, SCREENING_LIMITS.maxEiNoxGPerKg, 'g/kg').nullable().default(null),
    engineCount: wholeIn('The engine count', SCREENING_LIMITS.minEngineCount, SCREENING_LIMITS.maxEngineCount),
    typicalMach: numberIn('The typical Mach', SCREENING_LIMITS.minMach, SCREENING_LIMITS.maxMach),
    typicalFlightLevel: wholeIn(
      'The typical cruise flight level',
      SCREENING_LIMITS.minFlightLevel,
      SCREENING_LIMITS.maxFlightLevel,
    ),
    defaultFleetId: idRef('The default fleet').default(null),
  })
  .superRefine((t, ctx) => {
    if (t.engineId === null && t.directEiGPerKg === null) {
      ctx.addIssue({
        code: 'custom',
        path: ['engineId'],
        message: 'Choose an engine, or give a direct EI NOx for a type without certification data.',
      });
    }
    if (t.engineId !== null && t.directEiGPerKg !== null) {
      ctx.addIssue({
        code: 'custom',
        path: ['directEiGPerKg'],
        message: 'Give either an engine or a direct EI NOx, not both: leave this empty when an engine is chosen.',
      });
    }
  });
export type AircraftTypeSave = z.output<typeof aircraftTypeSaveSchema>;
export type AircraftTypeForm = z.input<typeof aircraftTypeSaveSchema>;

// ---------------------------------------------------------------------------------------------
// Soundings

export const SOUNDING_NAME_MAX = 120;
export const SOUNDING_STATION_MAX = 120;

const ISO_LIKE = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?)?$/;

/**
 * Observation time: empty (unknown), a date, or a date and time; a time without a zone is read as
 * UTC. Stored as ISO UTC text.
 */
export const observedAtSchema = z
  .union([z.string({ error: 'The observation time must be text such as 2026-11-20T12:00Z.' }), z.null()])
  .optional()
  .transform((value, ctx) => {
    const v = (value ?? '').trim();
    if (!v) return null;
    const m = ISO_LIKE.exec(v);
    if (!m) {
      ctx.addIssue({ code: 'custom', message: 'Write the observation time as YYYY-MM-DD or YYYY-MM-DDTHH:MM (UTC).' });
      return z.NEVER;
    }
    const [y, mo, day, hh, mm, ss] = [m[1], m[2], m[3], m[4] ?? '00', m[5] ?? '00', m[6] ?? '00'].map(Number);
    const calendar = new Date(Date.UTC(y, mo - 1, day));
    const real =
      calendar.getUTCFullYear() === y &&
      calendar.getUTCMonth() === mo - 1 &&
      calendar.getUTCDate() === day &&
      hh <= 23 &&
      mm <= 59 &&
      ss <= 59;
    const zone = m[7] ?? 'Z';
    const offset = zone === 'Z' ? 'Z' : `${zone.slice(0, 3)}:${zone.slice(-2)}`;
    const d = new Date(
      `${m[1]}-${m[2]}-${m[3]}T${String(hh).padStart(2, '0')}:${String(mm).padStart(2, '0')}:${String(ss).padStart(2, '0')}${offset}`,
    );
    if (!real || Number.isNaN(d.getTime())) {
      ctx.addIssue({ code: 'custom', message: 'The observation time is not a real date and time.' });
      return z.NEVER;
    }
    return d.toISOString();
  });

/** The descriptive fields of a sounding (also the form fields beside an uploaded CSV). */
export const soundingMetaSchema = z.object({
  name: requiredText('A sounding name', SOUNDING_NAME_MAX),
  station: text('The station', SOUNDING_STATION_MAX).default(''),
  observedAt: observedAtSchema,
});
export type SoundingMeta = z.output<typeof soundingMetaSchema>;
export type SoundingMetaForm = z.input<typeof soundingMetaSchema>;

/** A sounding sent as JSON: `{ name, station?, observedAt?, levels }` (3-500 levels). */
export const soundingCreateSchema = soundingMetaSchema.extend({ levels: soundingSchema }).strict();
export type SoundingCreate = z.output<typeof soundingCreateSchema>;

/** The largest library CSV accepted, bytes (engines or sounding levels). */
export const LIBRARY_CSV_MAX_BYTES = 512_000;
/** Most engines one CSV may add. */
export const ENGINE_CSV_MAX_ROWS = 500;
