/**
 * Flown tracks: points (time, position, level) turned into the route and level steps the screening
 * segments, with the time spent on each step when the points carry times.
 */
import { ScreeningInputError } from './errors';
import { legDistanceKm } from './great-circle';
import { isoTimeMs } from '../validation/iso-time';
import type { FieldProblem, ScreeningInput, WaypointsScreeningInput } from '../validation/screening';

/** What the screening made of a track (kept on the result). */
export interface TrackUsed {
  points: number;
  /** Time from the first to the last point, s; null when the points have no times. */
  durationS: number | null;
  /** Distinct flight levels flown, lowest first. */
  levels: number[];
  /** Points whose level came from the entered cruise because they had none. */
  pointsWithoutLevel: number;
  /**
   * Fuel integrated from the points' own fuel flows (kg/h, trapezoid rule over each leg's time), kg;
   * null when the points carry no fuel flow and the entered total is spread by time.
   */
  fuelFromFlowKg: number | null;
  /** The total fuel entered with the track when the points' fuel flows replaced it, kg; else null. */
  enteredFuelKg: number | null;
}

export interface ExpandedTrack {
  input: WaypointsScreeningInput;
  track: TrackUsed;
  /** Seconds spent on each cruise step, in step order; null when the points have no times. */
  stepDurationsS: number[] | null;
  /** Fuel burned on each cruise step from the points' fuel flows, kg; null without fuel flows. */
  stepFuelKg: number[] | null;
  /** Waypoint coordinates (degrees), the same as the input's waypoints, ready for the route plan. */
  lat: Float64Array;
  lon: Float64Array;
}

/** One point of a track as the engine reads it. */
interface TrackPointInput {
  time?: string;
  lat: number;
  lon: number;
  flightLevel?: number;
  pressureAltitudeFt?: number;
  fuelFlowKgH?: number;
}

type TrackInput = ScreeningInput & {
  route: {
    track: { points: TrackPointInput[] };
  };
};

function cruiseLevelAt(cruise: ScreeningInput['cruise'], km: number): number {
  if ('flightLevel' in cruise) return cruise.flightLevel;
  let fl = cruise.steps[0].flightLevel;
  for (const s of cruise.steps) if (s.fromKm <= km) fl = s.flightLevel;
  return fl;
}

/**
 * A track input as waypoints and steps: each leg between two points is flown at the mean of its two
 * ends' levels to the nearest flight level (pressure altitude in ft / 100 for points given in feet;
 * the entered cruise for points with no level); each leg starts a step at the cumulative great-circle
 * distance (km, mean sphere) of its first point (without times, consecutive legs at one level make
 * one step). With times, each step keeps the seconds flown on it, so fuel is spread by the track's
 * own time; time spent without moving goes to the step being flown. With a fuel flow (kg/h) on every
 * point, each leg burns the mean of its two ends' flows over its time (trapezoid rule) and the sum
 * replaces the entered total fuel.
 */
export function expandTrackInput(input: TrackInput): ExpandedTrack {
  const pts = input.route.track.points;
  const n = pts.length;
  const lat = new Float64Array(n);
  const lon = new Float64Array(n);
  const fl = new Float64Array(n);
  let withoutLevel = 0;
  const cumKm = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    lat[i] = pts[i].lat;
    lon[i] = pts[i].lon;
    if (i > 0) cumKm[i] = cumKm[i - 1] + legDistanceKm(lat[i - 1], lon[i - 1], lat[i], lon[i]);
  }
  for (let i = 0; i < n; i++) {
    const p = pts[i];
    if (p.flightLevel !== undefined) fl[i] = p.flightLevel;
    else if (p.pressureAltitudeFt !== undefined) fl[i] = p.pressureAltitudeFt / 100;
    else {
      fl[i] = cruiseLevelAt(input.cruise, cumKm[i]);
      withoutLevel++;
    }
  }
  const timed = n > 0 && pts[0].time !== undefined;
  let t: Float64Array | null = null;
  if (timed) {
    t = new Float64Array(n);
    for (let i = 0; i < n; i++) t[i] = isoTimeMs(pts[i].time ?? '') / 1000;
  }
  const totalS = t !== null ? t[n - 1] - t[0] : 0;
  const useTime = t !== null && totalS > 0;
  const flowing = useTime && pts.every((p) => p.fuelFlowKgH !== undefined);

  const steps: { fromKm: number; flightLevel: number }[] = [];
  const durations: number[] = [];
  const fuels: number[] = [];
  let pendingS = 0;
  let pendingKg = 0;
  let fuelTotal = 0;
  for (let i = 0; i + 1 < n; i++) {
    const legKm = cumKm[i + 1] - cumKm[i];
    const dur = useTime && t !== null ? t[i + 1] - t[i] : 0;
    const legKg = flowing ? ((((pts[i].fuelFlowKgH ?? 0) + (pts[i + 1].fuelFlowKgH ?? 0)) / 2) * dur) / 3600 : 0;
    fuelTotal += legKg;
    if (!(legKm > 0)) {
      // Time (and fuel) spent without moving, a hold over one point, belongs to the step being flown.
      if (durations.length > 0) {
        durations[durations.length - 1] += dur;
        fuels[fuels.length - 1] += legKg;
      } else {
        pendingS += dur;
        pendingKg += legKg;
      }
      continue;
    }
    const level = Math.round((fl[i] + fl[i + 1]) / 2);
    // With times every leg is its own step, so its fuel follows its own time; without, legs at one level merge.
    if (steps.length === 0 || useTime || steps[steps.length - 1].flightLevel !== level) {
      steps.push({ fromKm: steps.length === 0 ? 0 : cumKm[i], flightLevel: level });
      durations.push(pendingS);
      fuels.push(pendingKg);
      pendingS = 0;
      pendingKg = 0;
    }
    durations[durations.length - 1] += dur;
    fuels[fuels.length - 1] += legKg;
  }
  if (steps.length === 0) {
    const problems: FieldProblem[] = [
      { path: 'route.track.points', message: 'The track has no length: its points are all at the same place.' },
    ];
    throw new ScreeningInputError(problems);
  }
  if (flowing && !(fuelTotal > 0)) {
    throw new ScreeningInputError([
      { path: 'route.track.points.0.fuelFlowKgH', message: "The fuel flows over the track's times add up to no fuel." },
    ]);
  }
  const levels = [...new Set(steps.map((s) => s.flightLevel))].sort((a, b) => a - b);
  const waypoints = new Array<{ lat: number; lon: number }>(n);
  for (let i = 0; i < n; i++) waypoints[i] = { lat: lat[i], lon: lon[i] };
  return {
    input: {
      ...input,
      route: { waypoints },
      cruise: steps.length === 1 ? { flightLevel: steps[0].flightLevel } : { steps },
      fuelBurnKg: flowing ? fuelTotal : input.fuelBurnKg,
    },
    track: {
      points: n,
      durationS: useTime ? totalS : null,
      levels,
      pointsWithoutLevel: withoutLevel,
      fuelFromFlowKg: flowing ? fuelTotal : null,
      enteredFuelKg: flowing && input.fuelBurnKg !== fuelTotal ? input.fuelBurnKg : null,
    },
    stepDurationsS: useTime ? durations : null,
    stepFuelKg: flowing ? fuels : null,
    lat,
    lon,
  };
}

/** True when the route of this input is a track. */
export function isTrackInput(input: ScreeningInput): input is TrackInput {
  return 'track' in input.route;
}

/** Fuel (kg) from raw track points' fuel flows and times (trapezoid rule), or null when they do not all have both. */
function rawFlowFuelKg(points: unknown[]): number | null {
  let total = 0;
  let prevT = Number.NaN;
  let prevF = Number.NaN;
  for (const p of points) {
    if (typeof p !== 'object' || p === null) return null;
    const q = p as Record<string, unknown>;
    if (typeof q.fuelFlowKgH !== 'number' || typeof q.time !== 'string') return null;
    const t = isoTimeMs(q.time) / 1000;
    if (!Number.isFinite(t) || !Number.isFinite(q.fuelFlowKgH)) return null;
    if (Number.isFinite(prevT)) total += (((prevF + q.fuelFlowKgH) / 2) * (t - prevT)) / 3600;
    prevT = t;
    prevF = q.fuelFlowKgH;
  }
  return total > 0 ? total : null;
}

/**
 * A raw track input without a cruise gets one from its first point with a level, since the track
 * carries its own levels; one without a fuel burn whose points all carry a fuel flow and a time gets
 * the integrated fuel (the engine integrates it again per step). Other inputs are returned as they are.
 */
export function withTrackCruise(raw: unknown): unknown {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return raw;
  let r = raw as Record<string, unknown>;
  if (typeof r.route !== 'object' || r.route === null) return raw;
  const track = (r.route as Record<string, unknown>).track;
  if (typeof track !== 'object' || track === null) return raw;
  const points = (track as Record<string, unknown>).points;
  if (!Array.isArray(points)) return raw;
  if (r.fuelBurnKg === undefined) {
    const fuel = rawFlowFuelKg(points);
    if (fuel !== null) r = { ...r, fuelBurnKg: fuel };
  }
  if (r.cruise !== undefined) return r;
  for (const p of points) {
    if (typeof p !== 'object' || p === null) continue;
    const q = p as Record<string, unknown>;
    const level =
      typeof q.flightLevel === 'number'
        ? q.flightLevel
        : typeof q.pressureAltitudeFt === 'number'
          ? q.pressureAltitudeFt / 100
          : null;
    if (level !== null && Number.isFinite(level) && level >= 0 && level <= 660)
      return { ...r, cruise: { flightLevel: Math.round(level) } };
  }
  return r;
}
