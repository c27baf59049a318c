/**
 * Routes: waypoints resolved to coordinates, great-circle legs by geolib (spherical) and positions
 * along them.
 */
import { earthRadius } from 'geolib';
import { findAirport } from './airports';
import { ScreeningInputError } from './errors';
import type { FieldProblem, Waypoint } from '../validation/screening';

/**
 * Sphere radius of all great-circle work, m: the IUGG mean Earth radius R1. geolib's getDistance
 * works on its equatorial `earthRadius` (6 378 137 m), which overstates meridional distances near
 * the equator by up to 0.7 % against the WGS-84 geodesic; on the mean sphere the difference stays
 * within about 0.56 %. Leg lengths are geolib's distances rescaled to this radius.
 */
export const EARTH_RADIUS_M = 6_371_008.8;
const GEOLIB_TO_MEAN_SPHERE = EARTH_RADIUS_M / earthRadius;
// Chord length (unit sphere) below which two waypoints are the same place (about 6 mm).
const SAME_PLACE_CHORD = 1e-9;
/** Longest segment the engine screens, km. */
export const MAX_SEGMENT_KM = 50;

const DEG = Math.PI / 180;

/** A route ready for segmenting: per-leg geometry on the sphere. Distances in km. */
export interface RoutePlan {
  /** Waypoint latitudes and longitudes, degrees. */
  lat: Float64Array;
  lon: Float64Array;
  /** Great-circle length of each leg (waypoint i to i+1), km. */
  legKm: Float64Array;
  /** Distance from the route start to each leg's start, km. */
  legStartKm: Float64Array;
  /** Unit vector of each leg's start and the unit tangent towards its end (Earth-centred). */
  ax: Float64Array;
  ay: Float64Array;
  az: Float64Array;
  tx: Float64Array;
  ty: Float64Array;
  tz: Float64Array;
  /** Total route length, km. */
  totalKm: number;
}

/**
 * Resolves waypoints (`{lat, lon}` or `{airport}`) to coordinates in degrees. Unknown codes throw
 * ScreeningInputError at `${basePath}.N.airport`.
 */
export function resolveWaypoints(
  waypoints: readonly Waypoint[],
  basePath = 'route.waypoints',
): { lat: Float64Array; lon: Float64Array } {
  const n = waypoints.length;
  const lat = new Float64Array(n);
  const lon = new Float64Array(n);
  let problems: FieldProblem[] | null = null;
  for (let i = 0; i < n; i++) {
    const w = waypoints[i];
    if ('airport' in w) {
      const a = findAirport(w.airport);
      if (a === null) {
        (problems ??= []).push({
          path: `${basePath}.${i}.airport`,
          message: `No airport with the code ${w.airport.toUpperCase()} is known: check the ICAO or IATA code.`,
        });
        continue;
      }
      lat[i] = a.lat;
      lon[i] = a.lon;
    } else {
      lat[i] = w.lat;
      lon[i] = w.lon;
    }
  }
  if (problems !== null) throw new ScreeningInputError(problems);
  return { lat, lon };
}

const GEOLIB_DEG_TO_RAD = Math.PI / 180;

/**
 * geolib's `getDistance(from, to, 0.001)` (m, on its equatorial radius) written out with the same
 * operations in the same order, so it gives the same bits without geolib's per-call coordinate-key
 * lookups and parsing (a 20 000-point track spent most of its screening there). A unit test holds
 * the two equal.
 */
export function geolibDistanceM(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const fromLat = lat1 * GEOLIB_DEG_TO_RAD;
  const toLat = lat2 * GEOLIB_DEG_TO_RAD;
  const deltaLon = (lon1 - lon2) * GEOLIB_DEG_TO_RAD;
  const c = Math.sin(toLat) * Math.sin(fromLat) + Math.cos(toLat) * Math.cos(fromLat) * Math.cos(deltaLon);
  const distance = Math.acos(c > 1 ? 1 : c < -1 ? -1 : c) * earthRadius;
  return Math.round(distance / 0.001) * 0.001;
}

/** Great-circle distance (km) between two points (degrees): geolib's getDistance on the mean sphere. */
export function legDistanceKm(lat1: number, lon1: number, lat2: number, lon2: number): number {
  return (geolibDistanceM(lat1, lon1, lat2, lon2) * GEOLIB_TO_MEAN_SPHERE) / 1000;
}

/**
 * Builds the great-circle plan of resolved waypoints (degrees). Leg lengths from geolib's
 * `getDistance` (spherical, to the millimetre) on the mean sphere. Throws ScreeningInputError when
 * the route has no length or when two consecutive waypoints are antipodal (within millimetres),
 * which leaves the great circle undefined.
 */
export function planRoute(lat: Float64Array, lon: Float64Array, basePath = 'route.waypoints'): RoutePlan {
  const legs = lat.length - 1;
  const plan: RoutePlan = {
    lat,
    lon,
    legKm: new Float64Array(legs),
    legStartKm: new Float64Array(legs),
    ax: new Float64Array(legs),
    ay: new Float64Array(legs),
    az: new Float64Array(legs),
    tx: new Float64Array(legs),
    ty: new Float64Array(legs),
    tz: new Float64Array(legs),
    totalKm: 0,
  };
  let total = 0;
  for (let i = 0; i < legs; i++) {
    const p1 = lat[i] * DEG;
    const l1 = lon[i] * DEG;
    const p2 = lat[i + 1] * DEG;
    const l2 = lon[i + 1] * DEG;
    const ax = Math.cos(p1) * Math.cos(l1);
    const ay = Math.cos(p1) * Math.sin(l1);
    const az = Math.sin(p1);
    const bx = Math.cos(p2) * Math.cos(l2);
    const by = Math.cos(p2) * Math.sin(l2);
    const bz = Math.sin(p2);
    plan.ax[i] = ax;
    plan.ay[i] = ay;
    plan.az[i] = az;
    plan.legStartKm[i] = total;
    // geolib's acos formula leaves about 0.1 m of noise for coincident points: decide those here.
    if (Math.hypot(bx - ax, by - ay, bz - az) < SAME_PLACE_CHORD) continue;
    if (Math.hypot(bx + ax, by + ay, bz + az) < SAME_PLACE_CHORD) {
      throw new ScreeningInputError([
        {
          path: `${basePath}.${i + 1}`,
          message:
            'This waypoint is on the opposite side of the Earth from the one before: add a waypoint between them.',
        },
      ]);
    }
    const km = legDistanceKm(lat[i], lon[i], lat[i + 1], lon[i + 1]);
    plan.legKm[i] = km;
    total += km;
    const dot = ax * bx + ay * by + az * bz;
    let tx = bx - dot * ax;
    let ty = by - dot * ay;
    let tz = bz - dot * az;
    const norm = Math.sqrt(tx * tx + ty * ty + tz * tz);
    tx /= norm;
    ty /= norm;
    tz /= norm;
    plan.tx[i] = tx;
    plan.ty[i] = ty;
    plan.tz[i] = tz;
  }
  plan.totalKm = total;
  if (!(total > 0)) {
    throw new ScreeningInputError([
      { path: basePath, message: 'The route has no length: the waypoints are all at the same place.' },
    ]);
  }
  return plan;
}

/**
 * Latitude and longitude (degrees) at `kmAlong` km from the start of leg `leg`, on the sphere of
 * radius EARTH_RADIUS_M; writes into `out` ([lat, lon]) to avoid allocation.
 */
export function pointOnLeg(plan: RoutePlan, leg: number, kmAlong: number, out: Float64Array | number[]): void {
  const s = (kmAlong * 1000) / EARTH_RADIUS_M;
  const c = Math.cos(s);
  const sn = Math.sin(s);
  const x = plan.ax[leg] * c + plan.tx[leg] * sn;
  const y = plan.ay[leg] * c + plan.ty[leg] * sn;
  const z = plan.az[leg] * c + plan.tz[leg] * sn;
  out[0] = Math.asin(z > 1 ? 1 : z < -1 ? -1 : z) / DEG;
  out[1] = Math.atan2(y, x) / DEG;
}

/**
 * Great-circle length (km) of a route of waypoints (geolib, mean sphere). Throws ScreeningInputError
 * for unknown airports.
 */
export function routeDistanceKm(waypoints: readonly Waypoint[]): number {
  const { lat, lon } = resolveWaypoints(waypoints);
  let total = 0;
  for (let i = 0; i + 1 < lat.length; i++) total += legDistanceKm(lat[i], lon[i], lat[i + 1], lon[i + 1]);
  return total;
}
