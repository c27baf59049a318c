import { formatNumber } from '@/lib/format';
import { KG_PER_LB, type UnitSystem } from '@/lib/units';
import type { RouteWaypoint } from '@/db/routes';
import { pressureAltitudeM } from '@/lib/screening/atmosphere';

/** "EGLL", or "80.00°N 60.00°W" for a coordinate waypoint. */
export function waypointLabel(w: RouteWaypoint): string {
  if ('airport' in w) return w.airport;
  const lat = `${Math.abs(w.lat).toFixed(2)}°${w.lat >= 0 ? 'N' : 'S'}`;
  const lon = `${Math.abs(w.lon).toFixed(2)}°${w.lon >= 0 ? 'E' : 'W'}`;
  return `${lat} ${lon}`;
}

/** The waypoints of a route as one line: "EGLL → 80.00°N 60.00°W → KSEA". */
export function routeLine(waypoints: readonly RouteWaypoint[], max = 6): string {
  const labels = waypoints.map(waypointLabel);
  if (labels.length <= max) return labels.join(' → ');
  return `${labels.slice(0, max - 2).join(' → ')} → … (${labels.length - max + 1} more) → ${labels[labels.length - 1]}`;
}

/** Fuel flow per engine: kg/s as certified in the metric preference, lb/h (as flight decks show it) in the aviation one. */
export function formatFuelFlow(kgS: number, units: UnitSystem): string {
  return units === 'imperial' ? `${formatNumber((kgS * 3600) / KG_PER_LB, 0)}` : formatNumber(kgS, kgS < 1 ? 3 : 2);
}

export function fuelFlowUnit(units: UnitSystem): string {
  return units === 'imperial' ? 'lb/h' : 'kg/s';
}

/** Kelvin with degrees Celsius beside it. */
export function formatTemperature(k: number): string {
  return `${formatNumber(k, 1)} K (${formatNumber(k - 273.15, 1)} °C)`;
}

/** The flight level whose ISA pressure altitude is `altitudeM`, to the nearest whole level. */
export function flightLevelOf(altitudeM: number): string {
  return `FL${String(Math.round(altitudeM / 30.48)).padStart(3, '0')}`;
}

/** The flight level whose ISA pressure is `pressureHpa` ("FL361" for 226.3 hPa), or null outside the ISA table. */
export function flightLevelAtPressure(pressureHpa: number): string | null {
  try {
    return flightLevelOf(pressureAltitudeM(pressureHpa * 100));
  } catch {
    return null;
  }
}
