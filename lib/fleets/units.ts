import type { UnitSystem } from '@/db/users';
import { KG_PER_LB } from '@/lib/format';

/** One display unit for a whole chart axis: kg or t (metric), lb (imperial). */
export function massAxisUnit(maxKg: number, units: UnitSystem): { unit: string; perKg: number } {
  if (units === 'imperial') return { unit: 'lb', perKg: 1 / KG_PER_LB };
  return maxKg >= 10_000 ? { unit: 't', perKg: 1 / 1000 } : { unit: 'kg', perKg: 1 };
}

/** "Nice" axis ticks from 0 to at least `max`: steps of 1, 2, 2.5 or 5 x 10^n. */
export function niceTicks(max: number, target = 5): number[] {
  if (!(max > 0)) return [0, 1];
  const raw = max / target;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const ticks: number[] = [];
  for (let v = 0; v < max + step * 1e-9; v += step) ticks.push(Number(v.toPrecision(12)));
  if (ticks[ticks.length - 1] < max) ticks.push(Number((ticks[ticks.length - 1] + step).toPrecision(12)));
  return ticks;
}

/** Month label "2026-09" -> "Sep 2026". */
export function monthLabel(ym: string): string {
  const [y, m] = ym.split('-').map(Number);
  const names = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
  return `${names[m - 1] ?? '?'} ${y}`;
}

/** Colours of fleets in charts, in order (tokens of tailwind.config.ts first). */
export const FLEET_COLOURS = [
  '#6a3d9a',
  '#23867a',
  '#1d5fa8',
  '#9a5a12',
  '#b3261e',
  '#4b2574',
  '#15594f',
  '#3d4a63',
] as const;

/** "2026.12.1 (40 flights), 2026.12.2 (60 flights)". */
export function engineVersionsText(versions: { engineVersion: string; flights: number }[]): string {
  return versions.map((v) => `${v.engineVersion} (${v.flights} flight${v.flights === 1 ? '' : 's'})`).join(', ');
}

/** The caution a comparison or report carries when its flights were screened by different engine versions. */
export function mixedEngineVersionCaution(versions: { engineVersion: string; flights: number }[]): string[] {
  if (versions.length < 2) return [];
  return [
    `These figures mix engine versions: ${engineVersionsText(versions)}. Flights screened with different versions are not fully comparable; screen the older imports again with the current method under Imports (not billed again).`,
  ];
}
