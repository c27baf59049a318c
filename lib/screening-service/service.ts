import 'server-only';
import { z } from 'zod';
import {
  compareValidated,
  routeDistanceKm,
  screenValidated,
  sweepMonthsValidated,
  SAME_EVERY_MONTH_NOTE,
  ScreeningInputError,
  ENGINE_VERSION,
  validateScreeningInput,
  validateCompareOptions,
  type CruiseLevelRow,
  type MonthRow,
  type RouteLibrary,
  type ScreeningInput,
  type ScreeningResult,
} from '@/lib/screening';
import { getAircraftForScreening } from '@/db/aircraft-lookup';
import { loadRouteLibrary } from '@/db/route-library';
import { createScreening, getScreening, type ScreeningRecord } from './saved';
import { AppError, badRequest, conflict, invalidFields, type FieldProblem } from '@/lib/errors';
import { previewMonthsSchema } from '@/lib/validation/screening';
import { checkFuelPlausibility } from '@/lib/validation/plausibility';
import type { Waypoint } from '@/lib/validation/screening';

/** Fields a saved screening carries beside the engine input (the input plus an optional name). */
const extrasSchema = z.object({
  name: z.string({ error: 'The name must be text.' }).trim().max(160, 'Use at most 160 characters.').optional(),
  aircraft: z
    .string({ error: 'The aircraft type must be a code, such as SK-LR1.' })
    .trim()
    .min(1, 'Give an aircraft type code.')
    .max(16, 'An aircraft type code has at most 16 characters.')
    .optional(),
  whatIf: z.unknown().optional(),
  months: previewMonthsSchema.optional(),
});

export interface ParsedScreeningBody {
  name?: string;
  aircraftCode: string | null;
  input: ScreeningInput;
  whatIf?: unknown;
  /** Preview only: add the month sweep. */
  months?: boolean;
  /** The workspace's fixes and airways when the route is a flight plan (empty otherwise). */
  library: RouteLibrary;
}

/**
 * Step climbs placed at a waypoint (`{ atWaypoint, flightLevel }`, the waypoint's index in the route)
 * become `{ fromKm, flightLevel }`: fromKm is the distance along the route to that waypoint, measured
 * as the engine measures the route. Before validation, so the engine sees only distances.
 */
function placeStepsAtWaypoints(raw: Record<string, unknown>, problems: FieldProblem[]): void {
  const cruise = raw.cruise;
  if (typeof cruise !== 'object' || cruise === null || !('steps' in cruise) || !Array.isArray(cruise.steps)) return;
  const route = raw.route;
  const waypoints =
    typeof route === 'object' && route !== null && 'waypoints' in route && Array.isArray(route.waypoints)
      ? (route.waypoints as Waypoint[])
      : null;
  const steps: unknown[] = cruise.steps;
  raw.cruise = {
    ...cruise,
    steps: steps.map((step, i) => {
      if (typeof step !== 'object' || step === null || !('atWaypoint' in step)) return step;
      const { atWaypoint, ...rest } = step as { atWaypoint: unknown };
      const path = `cruise.steps.${i}.atWaypoint`;
      if (!waypoints) {
        problems.push({ path, message: 'A step at a waypoint needs a route given as waypoints.' });
        return rest;
      }
      if (
        typeof atWaypoint !== 'number' ||
        !Number.isInteger(atWaypoint) ||
        atWaypoint < 1 ||
        atWaypoint > waypoints.length - 1
      ) {
        problems.push({
          path,
          message: `atWaypoint must be a waypoint number from 1 to ${waypoints.length - 1} (0 is the departure).`,
        });
        return rest;
      }
      try {
        return { ...rest, fromKm: Math.round(routeDistanceKm(waypoints.slice(0, atWaypoint + 1)) * 1000) / 1000 };
      } catch {
        problems.push({ path, message: 'The route up to this waypoint could not be measured: check its waypoints.' });
        return rest;
      }
    }),
  };
}

/**
 * Splits a request body into our extras (`name`, `aircraft`, `whatIf`) and the engine input, fills
 * the emission (and Mach) from the workspace's aircraft type when the body names one and gives no
 * emission, and validates everything: problems from both parts come back together, by path.
 */
export async function parseScreeningBody(raw: unknown, scope: { workspaceId: number }): Promise<ParsedScreeningBody> {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw))
    throw badRequest('The body must be a JSON object.');
  const { name, aircraft, whatIf, months, ...engineRaw } = raw as Record<string, unknown>;
  const problems: FieldProblem[] = [];
  const extras = extrasSchema.safeParse({ name, aircraft, whatIf, months });
  if (!extras.success)
    for (const i of extras.error.issues) problems.push({ path: i.path.join('.'), message: i.message });
  let aircraftCode: string | null = null;
  if (extras.success && extras.data.aircraft) {
    const type = await getAircraftForScreening(scope, extras.data.aircraft);
    if (!type)
      problems.push({
        path: 'aircraft',
        message: `No aircraft type “${extras.data.aircraft}” in this workspace. Add it under Engines & aircraft.`,
      });
    else {
      aircraftCode = type.code;
      if (engineRaw.emission === undefined) {
        if (type.emission) engineRaw.emission = type.emission;
        else
          problems.push({
            path: 'aircraft',
            message: `Aircraft type ${type.code} has neither an engine nor a direct EI NOx.`,
          });
      }
      if (engineRaw.mach === undefined) engineRaw.mach = type.typicalMach;
    }
  }
  placeStepsAtWaypoints(engineRaw, problems);
  let input: ScreeningInput | undefined;
  try {
    input = validateScreeningInput(engineRaw);
  } catch (err) {
    if (err instanceof ScreeningInputError) problems.push(...err.fields);
    else throw err;
  }
  if (problems.length || !input) throw invalidFields(problems);
  const library = 'flightPlan' in input.route ? await loadRouteLibrary(scope) : {};
  return {
    name: extras.success ? extras.data.name : undefined,
    aircraftCode,
    input,
    whatIf: extras.success ? extras.data.whatIf : undefined,
    months: extras.success ? extras.data.months : undefined,
    library,
  };
}

/**
 * Screens an input `parseScreeningBody` validated, a flight-plan route read through the workspace's
 * library; unknown airports and an unplaceable flight plan still come back as 422. Fuel against
 * distance is checked on the screened route (lib/validation/plausibility.ts): an impossible burn is a
 * 422 on `fuelBurnKg`; an unusual one is the first caution of the result, so it is shown with the
 * preview and kept with a saved screening.
 */
export function runScreening(
  input: ScreeningInput,
  library?: RouteLibrary,
  aircraftCode: string | null = null,
): ScreeningResult {
  const result = screenValidated(input, library);
  const engine =
    'engine' in input.emission
      ? { fuelFlowKgS: input.emission.engine.fuelFlowKgS, engineCount: input.emission.engineCount }
      : null;
  const mach = input.mach ?? ('engine' in input.emission ? input.emission.mach : undefined);
  const p = checkFuelPlausibility({ distanceKm: result.distanceKm, fuelKg: result.fuelKg, engine, mach, aircraftCode });
  if (p.level === 'impossible') throw invalidFields([{ path: 'fuelBurnKg', message: p.message }]);
  if (p.level === 'unusual') return { ...result, cautions: [p.message, ...result.cautions] };
  return result;
}

/**
 * The what-if levels of an input `parseScreeningBody` validated; `planned` is that input's own
 * screening when the caller already has it (it then is not screened again).
 */
export function runWhatIf(
  input: ScreeningInput,
  whatIf: unknown,
  planned?: ScreeningResult,
  library?: RouteLibrary,
): CruiseLevelRow[] {
  const options = whatIf === undefined ? {} : whatIf;
  if (typeof options !== 'object' || options === null || Array.isArray(options)) {
    throw invalidFields([
      {
        path: 'whatIf',
        message: 'whatIf must be an object { deltasFt?, fuelPenaltyPctPer1000Ft?, maxFuelPenaltyPct?, minimise? }.',
      },
    ]);
  }
  try {
    return compareValidated(input, validateCompareOptions(options), planned, library);
  } catch (err) {
    if (err instanceof ScreeningInputError) {
      throw invalidFields(
        err.fields.map((f) => ({ path: f.path.replace(/^options\b/, 'whatIf'), message: f.message })),
      );
    }
    throw err;
  }
}

/** The month sweep of an input `parseScreeningBody` validated, with whether an override or sounding fixes it. */
export function runMonthSweep(
  input: ScreeningInput,
  library?: RouteLibrary,
): { rows: MonthRow[]; sameEveryMonth: boolean; note: string | null } {
  const rows = sweepMonthsValidated(input, library);
  const same = rows[0]?.sameEveryMonth ?? false;
  return { rows, sameEveryMonth: same, note: same ? SAME_EVERY_MONTH_NOTE : null };
}

/**
 * Screens a saved screening's input again with the current engine and saves it as a new screening
 * that points at the old one. Not billed: the flight was billed once, when first screened. A second
 * request for the same screening and engine returns the re-screen already made (`replayed`).
 */
export async function rescreenScreening(
  scope: { workspaceId: number },
  id: number,
  actor: { userId: number | null; apiKeyId: number | null },
): Promise<{ record: ScreeningRecord; replayed: boolean }> {
  const source = await getScreening(scope, id);
  if (source.engineVersion === ENGINE_VERSION) {
    throw conflict(
      `Screening #${source.id} was made with the current engine version (${ENGINE_VERSION}); there is nothing to screen again.`,
    );
  }
  let input: ScreeningInput;
  try {
    input = validateScreeningInput(source.input);
  } catch (err) {
    if (err instanceof ScreeningInputError) {
      throw new AppError(
        'invalid_fields',
        `The input saved with screening #${source.id} is not accepted by engine version ${ENGINE_VERSION}; screen the flight again from the form.`,
        { fields: err.fields },
      );
    }
    throw err;
  }
  const library = 'flightPlan' in input.route ? await loadRouteLibrary(scope) : {};
  const result = screenValidated(input, library);
  const create = () =>
    createScreening(scope, {
      name: source.name,
      aircraftCode: source.aircraftCode,
      screening: input,
      result,
      createdBy: actor.userId,
      apiKeyId: actor.apiKeyId,
      rescreenOf: source.id,
    });
  try {
    return await create();
  } catch (err) {
    // Two requests at once: the unique (rescreen_of, engine_version) lets one insert; the other reads it.
    if (isUniqueViolation(err)) return create();
    throw err;
  }
}

function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; message?: string };
  return (
    e?.code === 'SQLITE_CONSTRAINT_UNIQUE' || e?.code === '23505' || /UNIQUE constraint failed/.test(e?.message ?? '')
  );
}
