import 'server-only';
import { findAirport } from '@/lib/screening';
import type { ScreeningInput } from '@/lib/validation/screening';
import type { ScreeningResult } from '@/lib/screening';
import type { MapPoint } from '@/components/maps/route-map';
import { MONTH_NAMES } from '@/lib/format';

/**
 * The route's points for the map: airports by their ICAO code (IATA when it has none), coordinates as
 * given; for a flight plan, the points the screening placed (named as in the text).
 */
export function mapPointsFor(input: ScreeningInput, result?: Pick<ScreeningResult, 'flightPlan'>): MapPoint[] {
  const out: MapPoint[] = [];
  if ('flightPlan' in input.route) {
    for (const w of result?.flightPlan?.waypoints ?? []) out.push({ lat: w.lat, lon: w.lon, label: w.name ?? null });
    return out;
  }
  if ('track' in input.route) {
    const pts = input.route.track.points;
    // A track of thousands of points draws the same line from a few hundred of them.
    const stride = Math.max(1, Math.ceil(pts.length / 500));
    for (let i = 0; i < pts.length; i += stride) out.push({ lat: pts[i].lat, lon: pts[i].lon, label: null });
    const last = pts[pts.length - 1];
    if ((pts.length - 1) % stride !== 0) out.push({ lat: last.lat, lon: last.lon, label: null });
    return out;
  }
  for (const w of input.route.waypoints) {
    if ('airport' in w) {
      const a = findAirport(w.airport);
      if (a) out.push({ lat: a.lat, lon: a.lon, label: a.icao ?? a.iata ?? w.airport.toUpperCase() });
    } else out.push({ lat: w.lat, lon: w.lon, label: null });
  }
  return out;
}

/** "FL350" or "FL350 → FL390 at 4 000 km" style summary of the cruise. */
export function cruiseLabel(input: ScreeningInput): string {
  if ('flightLevel' in input.cruise) return `FL${input.cruise.flightLevel}`;
  return input.cruise.steps.map((s) => `FL${s.flightLevel}`).join(' → ');
}

/**
 * Which tropopause the figures used, for a result's header: the flight date, a named month ("January
 * tropopause", not "month 1"), or the annual mean. A month given beside a date wins in the engine, so
 * it is named when it differs from the date's month.
 */
export function tropopauseMonthLabel(
  input: Pick<ScreeningInput, 'flightDate' | 'month'>,
  result: Pick<ScreeningResult, 'month'>,
  formatDate: (iso: string) => string = (iso) => iso,
): string {
  const named = result.month ? `${MONTH_NAMES[result.month - 1]} tropopause` : null;
  if (input.flightDate) {
    const dated = `flight date ${formatDate(input.flightDate)}`;
    const dateMonth = Number(input.flightDate.slice(5, 7));
    return named && result.month !== dateMonth ? `${dated} · ${named}` : dated;
  }
  return named ?? 'annual-mean tropopause';
}
