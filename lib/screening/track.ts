/**
 * Flown tracks: points (time, position, level) turned into the route and level steps the screening
 * segments, with the time spent on each step when the points carry times.
 */
import { ScreeningInputError } from './errors';
import { legDistanceKm } from './route';
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
}

export interface ExpandedTrack {
  input: WaypointsScreeningInput;
  track: TrackUsed;
  /** Seconds spent on each cruise step, in step order; null when the points have no times. */
  stepDurationsS: number[] | null;
}

type TrackInput = ScreeningInput & {
  route: {
    track: { points: { time?: string; lat: number; lon: number; flightLevel?: number; pressureAltitudeFt?: number }[] };
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
 * own time; time spent without moving goes to the step being flown.
 */
export function expandTrackInput(input: TrackInput): ExpandedTrack {
  const pts = input.route.track.points;
  const n = pts.length;
  const fl = new Float64Array(n);
  let withoutLevel = 0;
  const cumKm = new Float64Array(n);
  for (let i = 1; i < n; i++)
    cumKm[i] = cumKm[i - 1] + legDistanceKm(pts[i - 1].lat, pts[i - 1].lon, pts[i].lat, pts[i].lon);
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
  const t = timed ? pts.map((p) => Date.parse(p.time ?? '') / 1000) : null;
  const totalS = t !== null ? t[n - 1] - t[0] : 0;
  const useTime = t !== null && totalS > 0;

  const steps: { fromKm: number; flightLevel: number }[] = [];
  const durations: number[] = [];
  let pendingS = 0;
  for (let i = 0; i + 1 < n; i++) {
    const legKm = cumKm[i + 1] - cumKm[i];
    const dur = useTime && t !== null ? t[i + 1] - t[i] : 0;
    if (!(legKm > 0)) {
      // Time spent without moving (a hold over one point) belongs to the step being flown.
      if (durations.length > 0) durations[durations.length - 1] += dur;
      else pendingS += dur;
      continue;
    }
    const level = Math.round((fl[i] + fl[i + 1]) / 2);
    // With times every leg is its own step, so its fuel follows its own time; without, legs at one level merge.
    if (steps.length === 0 || useTime || steps[steps.length - 1].flightLevel !== level) {
      steps.push({ fromKm: steps.length === 0 ? 0 : cumKm[i], flightLevel: level });
      durations.push(pendingS);
      pendingS = 0;
    }
    durations[durations.length - 1] += dur;
  }
  if (steps.length === 0) {
    const problems: FieldProblem[] = [
      { path: 'route.track.points', message: 'The track has no length: its points are all at the same place.' },
    ];
    throw new ScreeningInputError(problems);
  }
  const levels = [...new Set(steps.map((s) => s.flightLevel))].sort((a, b) => a - b);
  return {
    input: {
      ...input,
      route: { waypoints: pts.map((p) => ({ lat: p.lat, lon: p.lon })) },
      cruise: steps.length === 1 ? { flightLevel: steps[0].flightLevel } : { steps },
    },
    track: { points: n, durationS: useTime ? totalS : null, levels, pointsWithoutLevel: withoutLevel },
    stepDurationsS: useTime ? durations : null,
  };
}

/** True when the route of this input is a track. */
export function isTrackInput(input: ScreeningInput): input is TrackInput {
  return 'track' in input.route;
}

/**
 * A raw track input without a cruise gets one from its first point with a level, since the track
 * carries its own levels; other inputs are returned as they are.
 */
export function withTrackCruise(raw: unknown): unknown {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return raw;
  const r = raw as Record<string, unknown>;
  if (r.cruise !== undefined || typeof r.route !== 'object' || r.route === null) return raw;
  const track = (r.route as Record<string, unknown>).track;
  if (typeof track !== 'object' || track === null) return raw;
  const points = (track as Record<string, unknown>).points;
  if (!Array.isArray(points)) return raw;
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
  return raw;
}
