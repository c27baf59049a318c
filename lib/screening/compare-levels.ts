/**
 * What-if cruise levels: the same flight screened at other levels with a fuel penalty for leaving
 * the planned level, and the lowest-impact level within the planner's limit marked.
 */
import { CO2_PER_KG_FUEL, screenTotals, type ScreeningTotals } from './screen-flight';
import { expandFlightPlanInput, type RouteLibrary } from './flight-plan';
import { isTrackInput } from './track';
import { validateCompareOptions, validateScreeningInput } from './validate';
import { SCREENING_LIMITS, type ScreeningInput } from '../validation/screening';

/** Default level changes, ft: -4000 to +4000 in 2000 ft steps. */
export const DEFAULT_LEVEL_DELTAS_FT: readonly number[] = Object.freeze([-4000, -2000, 0, 2000, 4000]);
/**
 * Default fuel penalty, % more fuel per 1000 ft away from the planned (taken as optimum) level: a
 * rule of thumb (common practice, from memory).
 */
export const DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT = 1;
/** Default planner's limit on the fuel penalty, %. */
export const DEFAULT_MAX_FUEL_PENALTY_PCT = 2;

/**
 * What the lowest-impact mark minimises: the NOx emitted above the tropopause, or the central
 * gross ozone-loss figure (which ignores the extra fuel and the likely net ozone production below
 * about 13-20 km).
 */
export type MinimiseCriterion = 'nox-above-tropopause' | 'ozone-figure';
/** Default criterion of the mark. */
export const DEFAULT_MINIMISE: MinimiseCriterion = 'ozone-figure';
/** The name of the mark for each criterion, as shown beside it. */
export const MARK_NAMES: Readonly<Record<MinimiseCriterion, string>> = Object.freeze({
  'nox-above-tropopause': 'Least NOx above the tropopause',
  'ozone-figure': 'Least ozone figure',
});

/** One what-if level. Masses in kg (NOx as NO2). */
export interface CruiseLevelRow {
  /** First (or only) flight level of the shifted profile. */
  flightLevel: number;
  /** All step levels of the shifted profile, in route order. */
  flightLevels: number[];
  deltaFt: number;
  fuelKg: number;
  fuelPenaltyPct: number;
  /** Fuel and CO2 beside the planned level (+ more), kg; CO2 = 3.16 x fuel (ICAO CORSIA). */
  fuelChangeKg: number;
  co2ChangeKg: number;
  noxTotalKg: number;
  noxAboveTropopauseKg: number;
  ozoneLoss: { centralKg: number; lowKg: number; highKg: number; o3PerNox: number };
  withinLimit: boolean;
  lowestImpact: boolean;
  /** What the mark minimises, and its name. */
  minimise: MinimiseCriterion;
  markName: string;
}

/**
 * Screens the flight at its planned cruise shifted by each of `deltasFt` (default -4000..+4000 ft in
 * 2000 ft steps; every step of a step climb shifts together; shifts leaving FL0-FL660 are skipped).
 * Fuel = planned fuel x (1 + penalty/100), penalty = `fuelPenaltyPctPer1000Ft` (default 1 %, rule
 * of thumb) x |delta| / 1000 ft, added before NOx is computed. Marks exactly one row
 * `lowestImpact`: among rows within `maxFuelPenaltyPct` (default 2 %), the least of what `minimise`
 * names (default the central ozone figure; or the NOx above the tropopause), then the other, then
 * the smallest |delta|, then the lower level. Each row carries the fuel and CO2 change beside the
 * planned level and the name of the mark.
 * Throws ScreeningInputError for a bad input (paths as `screenFlight`) or bad options (`options.*`).
 */
export function compareCruiseLevels(
  input: unknown,
  options: {
    deltasFt?: number[];
    fuelPenaltyPctPer1000Ft?: number;
    maxFuelPenaltyPct?: number;
    minimise?: MinimiseCriterion;
  } = {},
): CruiseLevelRow[] {
  const base = validateScreeningInput(input);
  const opts = validateCompareOptions(options);
  return compareValidated(base, opts);
}

/**
 * As `compareCruiseLevels` for an already-validated input and options. `planned`, when given, is
 * the screening of `input` itself (for example the result shown beside the rows) and stands in for
 * the unshifted level instead of screening it again.
 */
export function compareValidated(
  input: ScreeningInput,
  opts: {
    deltasFt?: readonly number[];
    fuelPenaltyPctPer1000Ft?: number;
    maxFuelPenaltyPct?: number;
    minimise?: MinimiseCriterion;
  },
  planned?: ScreeningTotals,
  library?: RouteLibrary,
): CruiseLevelRow[] {
  const base = expandFlightPlanInput(input, library).input;
  const deltas = [...new Set(opts.deltasFt ?? DEFAULT_LEVEL_DELTAS_FT)].sort((a, b) => a - b);
  const perK = opts.fuelPenaltyPctPer1000Ft ?? DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT;
  const limit = opts.maxFuelPenaltyPct ?? DEFAULT_MAX_FUEL_PENALTY_PCT;
  const minimise = opts.minimise ?? DEFAULT_MINIMISE;
  const steps = 'steps' in base.cruise ? base.cruise.steps : [{ fromKm: 0, flightLevel: base.cruise.flightLevel }];
  const rows: CruiseLevelRow[] = [];
  for (const deltaFt of deltas) {
    const dFl = deltaFt / 100;
    const shifted = steps.map((s) => ({ fromKm: s.fromKm, flightLevel: s.flightLevel + dFl }));
    if (
      shifted.some(
        (s) => s.flightLevel < SCREENING_LIMITS.minFlightLevel || s.flightLevel > SCREENING_LIMITS.maxFlightLevel,
      )
    ) {
      continue;
    }
    const fuelPenaltyPct = (perK * Math.abs(deltaFt)) / 1000;
    const fuelKg = base.fuelBurnKg * (1 + fuelPenaltyPct / 100);
    // A track is shifted point by point, so its own times still spread the fuel.
    const track = isTrackInput(input) ? shiftTrack(input, dFl, 1 + fuelPenaltyPct / 100) : null;
    if (isTrackInput(input) && track === null) continue;
    const r =
      deltaFt === 0 && planned !== undefined
        ? planned
        : track !== null
          ? screenTotals({ ...track, fuelBurnKg: fuelKg })
          : screenTotals({
              ...base,
              cruise: 'steps' in base.cruise ? { steps: shifted } : { flightLevel: shifted[0].flightLevel },
              fuelBurnKg: fuelKg,
            });
    rows.push({
      flightLevel: shifted[0].flightLevel,
      flightLevels: shifted.map((s) => s.flightLevel),
      deltaFt,
      fuelKg,
      fuelPenaltyPct,
      fuelChangeKg: fuelKg - base.fuelBurnKg,
      co2ChangeKg: (fuelKg - base.fuelBurnKg) * CO2_PER_KG_FUEL,
      noxTotalKg: r.noxTotalKg,
      noxAboveTropopauseKg: r.noxAboveTropopauseKg,
      ozoneLoss: {
        centralKg: r.ozoneLoss.centralKg,
        lowKg: r.ozoneLoss.lowKg,
        highKg: r.ozoneLoss.highKg,
        o3PerNox: r.ozoneLoss.o3PerNox,
      },
      withinLimit: fuelPenaltyPct <= limit + 1e-12,
      lowestImpact: false,
      minimise,
      markName: MARK_NAMES[minimise],
    });
  }
  let best: CruiseLevelRow | null = null;
  for (const row of rows) {
    if (!row.withinLimit) continue;
    if (best === null || better(row, best, minimise)) best = row;
  }
  if (best !== null) best.lowestImpact = true;
  return rows;
}

/** A track input with every point's level (and the cruise) moved by `dFl`; null when one leaves FL0-FL660. */
function shiftTrack(input: ScreeningInput, dFl: number, fuelFactor: number): ScreeningInput | null {
  if (!('track' in input.route)) return null;
  const inRange = (fl: number) => fl >= SCREENING_LIMITS.minFlightLevel && fl <= SCREENING_LIMITS.maxFlightLevel;
  const points = [];
  for (const p of input.route.track.points) {
    const q = { ...p };
    if (q.flightLevel !== undefined) q.flightLevel += dFl;
    if (q.pressureAltitudeFt !== undefined) q.pressureAltitudeFt += dFl * 100;
    // Per-point fuel flows carry the fuel penalty themselves, since they replace the total.
    if (q.fuelFlowKgH !== undefined) q.fuelFlowKgH *= fuelFactor;
    const fl = q.flightLevel ?? (q.pressureAltitudeFt !== undefined ? q.pressureAltitudeFt / 100 : null);
    if (fl !== null && !inRange(fl)) return null;
    points.push(q);
  }
  const c = input.cruise;
  let cruise: ScreeningInput['cruise'];
  if ('flightLevel' in c) {
    if (!inRange(c.flightLevel + dFl)) return null;
    cruise = { flightLevel: c.flightLevel + dFl };
  } else {
    if (!c.steps.every((s) => inRange(s.flightLevel + dFl))) return null;
    cruise = { steps: c.steps.map((s) => ({ fromKm: s.fromKm, flightLevel: s.flightLevel + dFl })) };
  }
  return { ...input, route: { track: { points } }, cruise };
}

function better(a: CruiseLevelRow, b: CruiseLevelRow, minimise: MinimiseCriterion): boolean {
  const keys: ((r: CruiseLevelRow) => number)[] = [(r) => r.noxAboveTropopauseKg, (r) => r.ozoneLoss.centralKg];
  if (minimise === 'ozone-figure') keys.reverse();
  for (const k of keys) if (k(a) !== k(b)) return k(a) < k(b);
  if (Math.abs(a.deltaFt) !== Math.abs(b.deltaFt)) return Math.abs(a.deltaFt) < Math.abs(b.deltaFt);
  return a.deltaFt < b.deltaFt;
}
