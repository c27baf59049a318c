/**
 * Fuel against distance: a wide but physical band of cruise fuel per great-circle kilometre. Outside
 * the outer band a flight is impossible (refused, field named); between the outer and inner bands it
 * is unusual (accepted, with a warning on the row, the flight and the reports that include it).
 *
 * Sources of the band (common practice, from memory, deliberately wide):
 * - Without an engine: today's jets burn roughly 0.6 kg/km (light business jets) to 12-15 kg/km (the
 *   largest four-engine airliners) in cruise, and a supersonic airliner about 12 kg/km; the inner band
 *   is 0.5-20 kg/km, the outer 0.1-60 kg/km.
 * - With the type's engine certification fuel flows (ICAO engine emissions databank modes, sea level,
 *   kg/s per engine): cruise fuel flow at altitude is commonly 15-60 % of the take-off fuel flow,
 *   never above the take-off flow and not far below the idle flow. Fuel per km divides by the ground
 *   speed: Mach x the ISA speed of sound above 11 km, 295.07 m/s (ICAO Doc 7488), with winds allowed
 *   to change it between 0.7x and 1.3x (inner band) or 0.5x and 2x (outer band).
 */

export type Plausibility = { level: 'ok' } | { level: 'unusual' | 'impossible'; kgPerKm: number; message: string };

export interface PlausibilityInput {
  distanceKm: number;
  fuelKg: number;
  /** The engine's four ICAO-mode fuel flows (idle, approach, climb-out, take-off), kg/s per engine, when known. */
  engine?: { fuelFlowKgS: readonly number[]; engineCount: number } | null;
  /** Cruise Mach (0.8 when not given). */
  mach?: number;
  /** Named in the message ("for SK-LR1"). */
  aircraftCode?: string | null;
}

const SPEED_OF_SOUND_KMH = 295.07 * 3.6;

export const GENERIC_FUEL_BAND_KG_PER_KM = {
  impossibleBelow: 0.1,
  unusualBelow: 0.5,
  unusualAbove: 20,
  impossibleAbove: 60,
} as const;

export interface FuelBand {
  impossibleBelow: number;
  unusualBelow: number;
  unusualAbove: number;
  impossibleAbove: number;
}

/** The band for this flight: from its engine when known, else the generic one. */
export function fuelBandKgPerKm(input: Pick<PlausibilityInput, 'engine' | 'mach'>): FuelBand {
  const e = input.engine;
  if (!e || e.fuelFlowKgS.length !== 4 || !(e.engineCount > 0) || !e.fuelFlowKgS.every((f) => f > 0))
    return { ...GENERIC_FUEL_BAND_KG_PER_KM };
  const speedKmH = (input.mach && input.mach > 0 ? input.mach : 0.8) * SPEED_OF_SOUND_KMH;
  const perKm = (fuelFlowKgS: number) => (e.engineCount * fuelFlowKgS * 3600) / speedKmH;
  const [idle, , , takeOff] = e.fuelFlowKgS;
  return {
    impossibleBelow: perKm(idle) / 2,
    unusualBelow: (0.15 * perKm(takeOff)) / 1.3,
    unusualAbove: (0.6 * perKm(takeOff)) / 0.7,
    impossibleAbove: perKm(takeOff) / 0.5,
  };
}

const kg = (n: number) => (n >= 10 ? Math.round(n).toLocaleString('en-GB') : n.toFixed(n >= 1 ? 1 : 2));

/** Checks cruise fuel against distance; `ok` when the distance is unknown or zero (other checks catch that). */
export function checkFuelPlausibility(input: PlausibilityInput): Plausibility {
  if (!(input.distanceKm > 0) || !(input.fuelKg > 0)) return { level: 'ok' };
  const band = fuelBandKgPerKm(input);
  const kgPerKm = input.fuelKg / input.distanceKm;
  const what = `${kg(input.fuelKg)} kg of fuel over ${kg(input.distanceKm)} km is ${kg(kgPerKm)} kg per km`;
  const forType = input.aircraftCode ? ` for ${input.aircraftCode}` : '';
  if (kgPerKm > band.impossibleAbove || kgPerKm < band.impossibleBelow) {
    return {
      level: 'impossible',
      kgPerKm,
      message: `${what}: no aircraft${forType ? ` of this type` : ''} burns that (${kg(band.impossibleBelow)}-${kg(band.impossibleAbove)} kg per km is possible${forType}). Check the fuel and the route.`,
    };
  }
  if (kgPerKm > band.unusualAbove || kgPerKm < band.unusualBelow) {
    return {
      level: 'unusual',
      kgPerKm,
      message: `Unusual fuel: ${what}, outside the usual ${kg(band.unusualBelow)}-${kg(band.unusualAbove)} kg per km${forType}. Check the fuel and the route.`,
    };
  }
  return { level: 'ok' };
}

/** The unusual-fuel warning a screening result carries as its first caution, if any. */
export function fuelWarningOf(result: { cautions: readonly string[] }): string | null {
  const first = result.cautions[0];
  return first?.startsWith('Unusual fuel:') ? first : null;
}
