import { expandFlightPlanInput, type FlightPlanUsed, type RouteLibrary } from './flight-plan';
import { expandTrackInput, isTrackInput, type TrackUsed } from './track';
import type { ScreeningInput, WaypointsScreeningInput } from '../validation/screening';

/** A screening input with its route as waypoints, and what was read from a flight plan or a track. */
export interface ExpandedRoute {
  input: WaypointsScreeningInput;
  flightPlan: FlightPlanUsed | null;
  track: TrackUsed | null;
  /** Seconds flown on each cruise step (tracks with times), else null. */
  stepDurationsS: number[] | null;
  /** Fuel burned on each cruise step from a track's per-point fuel flows, kg; else null. */
  stepFuelKg: number[] | null;
  /** The waypoints' coordinates when already known (tracks), degrees; else null. */
  coords: { lat: Float64Array; lon: Float64Array } | null;
}

/** Any route form (waypoints, flight plan, track) as waypoints and steps; see the two expanders. */
export function expandRouteInput(input: ScreeningInput, library?: RouteLibrary): ExpandedRoute {
  if (isTrackInput(input)) {
    const t = expandTrackInput(input);
    return {
      input: t.input,
      flightPlan: null,
      track: t.track,
      stepDurationsS: t.stepDurationsS,
      stepFuelKg: t.stepFuelKg,
      coords: { lat: t.lat, lon: t.lon },
    };
  }
  const f = expandFlightPlanInput(input, library);
  return {
    input: f.input,
    flightPlan: f.flightPlan,
    track: null,
    stepDurationsS: null,
    stepFuelKg: null,
    coords: null,
  };
}
