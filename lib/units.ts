/**
 * Units: the exact conversion factors and the few conversions between what a person types or reads
 * and what is stored (SI: km, m, kg). Plain data and arithmetic, no imports; client-safe, and a leaf
 * that `db/` may import. Display formatting is in `lib/format.ts`.
 */

/** A user's display units: metric (km, m, kg) or aviation (NM, ft, lb). */
export type UnitSystem = 'metric' | 'imperial';

/** 1 NM = 1.852 km exactly (international nautical mile, 1929). */
export const KM_PER_NM = 1.852;
/** 1 ft = 0.3048 m exactly (international foot, 1959). */
export const M_PER_FT = 0.3048;
/** 1 lb = 0.45359237 kg exactly (international pound, 1959). */
export const KG_PER_LB = 0.45359237;
/** 1 t = 1000 kg. */
export const KG_PER_TONNE = 1000;
/** 1 km = 1000 m. */
export const M_PER_KM = 1000;

/** Fuel as typed (kg or lb) -> kg. */
export function fuelToKg(value: number, units: UnitSystem): number {
  return units === 'imperial' ? value * KG_PER_LB : value;
}

/** Distance as typed (km or NM) -> km. */
export function distanceToKm(value: number, units: UnitSystem): number {
  return units === 'imperial' ? value * KM_PER_NM : value;
}

/** Altitude as typed (m or ft) -> m. */
export function altitudeToM(value: number, units: UnitSystem): number {
  return units === 'imperial' ? value * M_PER_FT : value;
}

/** Metres -> feet. */
export function feetFromM(m: number): number {
  return m / M_PER_FT;
}

/** Kilograms -> pounds. */
export function poundsFromKg(kg: number): number {
  return kg / KG_PER_LB;
}

/** Kilometres -> nautical miles. */
export function nmFromKm(km: number): number {
  return km / KM_PER_NM;
}
