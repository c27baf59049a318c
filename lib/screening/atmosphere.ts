/**
 * ICAO standard atmosphere (ICAO Doc 7488/3 = ISO 2533:1975, identical to the US Standard
 * Atmosphere 1976 below 32 km). Altitudes are geopotential metres throughout.
 */

/** Standard gravity, m s^-2 (ICAO Doc 7488/3). */
export const G0 = 9.80665;
/** Specific gas constant of dry air, J kg^-1 K^-1 (ICAO Doc 7488/3). */
export const R_AIR = 287.05287;
/** Ratio of specific heats of air (ICAO Doc 7488/3). */
export const GAMMA_AIR = 1.4;
/** Sea-level standard temperature, K. */
export const T0_K = 288.15;
/** Sea-level standard pressure, Pa. */
export const P0_PA = 101_325;
/** Earth radius used to convert geometric to geopotential altitude, m (ICAO Doc 7488/3). */
export const R0_EARTH_M = 6_356_766;
/** Boltzmann constant, J K^-1 (SI 2019, exact). */
export const BOLTZMANN_J_K = 1.380649e-23;
/** Avogadro constant, mol^-1 (SI 2019, exact). */
export const AVOGADRO = 6.02214076e23;
/** Lowest geopotential altitude the public functions accept, m. */
export const ISA_MIN_ALTITUDE_M = -500;
/** Highest geopotential altitude the public functions accept, m. */
export const ISA_MAX_ALTITUDE_M = 32_000;

const BASE_H = [0, 11_000, 20_000, 32_000, 47_000];
const BASE_T = [288.15, 216.65, 216.65, 228.65, 270.65];
const LAPSE = [-0.0065, 0, 0.001, 0.0028, 0];
// Base pressures follow from p0 by continuity, so the tabulated 22 632.06 / 5474.889 / 868.0187 Pa
// are independent checks of the layer equations, not inputs.
const BASE_P: number[] = [P0_PA];
const EXPONENT: number[] = LAPSE.map((l) => (l === 0 ? 0 : G0 / (R_AIR * l)));
for (let i = 1; i < BASE_H.length; i++) {
  BASE_P.push(layerPressure(i - 1, BASE_H[i]));
}

function layerIndex(h: number): number {
  if (h < 11_000) return 0;
  if (h < 20_000) return 1;
  if (h < 32_000) return 2;
  if (h < 47_000) return 3;
  return 4;
}

function layerPressure(i: number, h: number): number {
  const l = LAPSE[i];
  if (l === 0) return BASE_P[i] * Math.exp((-G0 * (h - BASE_H[i])) / (R_AIR * BASE_T[i]));
  const t = BASE_T[i] + l * (h - BASE_H[i]);
  return BASE_P[i] * Math.pow(BASE_T[i] / t, EXPONENT[i]);
}

/** ISA temperature (K) at geopotential altitude `h` (m), no range check; extends the end layers. */
export function isaTemperatureAt(h: number): number {
  const i = layerIndex(h);
  return BASE_T[i] + LAPSE[i] * (h - BASE_H[i]);
}

/** ISA pressure (Pa) at geopotential altitude `h` (m), no range check; extends the end layers. */
export function isaPressureAt(h: number): number {
  return layerPressure(layerIndex(h), h);
}

/** ISA pressure altitude (geopotential m) of pressure `p` (Pa), no range check. */
export function isaPressureAltitudeAt(p: number): number {
  let i = 0;
  while (i < BASE_P.length - 1 && p <= BASE_P[i + 1]) i++;
  const l = LAPSE[i];
  if (l === 0) return BASE_H[i] - (R_AIR * BASE_T[i] * Math.log(p / BASE_P[i])) / G0;
  const t = BASE_T[i] / Math.pow(p / BASE_P[i], 1 / EXPONENT[i]);
  return BASE_H[i] + (t - BASE_T[i]) / l;
}

/** ISA state at one altitude. */
export interface IsaState {
  /** Geopotential altitude, m. */
  altitudeM: number;
  /** Static temperature, K. */
  temperatureK: number;
  /** Static pressure, Pa. */
  pressurePa: number;
  /** Density, kg m^-3 (p / (R T)). */
  densityKgM3: number;
  /** Speed of sound, m s^-1 (sqrt(gamma R T)). */
  speedOfSoundMs: number;
  /** Air number density, molecule cm^-3 (p / (kB T)). */
  numberDensityCm3: number;
}

function checkAltitude(h: number, name: string): void {
  if (!Number.isFinite(h) || h < ISA_MIN_ALTITUDE_M || h > ISA_MAX_ALTITUDE_M) {
    throw new RangeError(`${name} must be between ${ISA_MIN_ALTITUDE_M} and ${ISA_MAX_ALTITUDE_M} m (got ${h}).`);
  }
}

/**
 * ICAO standard atmosphere at geopotential altitude `altitudeM` (m, -500..32 000): temperature K,
 * pressure Pa, density kg m^-3, speed of sound m s^-1, air number density cm^-3. Source: ICAO Doc
 * 7488/3 layer equations. RangeError outside the range or for a non-number.
 */
export function isa(altitudeM: number): IsaState {
  checkAltitude(altitudeM, 'The altitude');
  const temperatureK = isaTemperatureAt(altitudeM);
  const pressurePa = isaPressureAt(altitudeM);
  return {
    altitudeM,
    temperatureK,
    pressurePa,
    densityKgM3: pressurePa / (R_AIR * temperatureK),
    speedOfSoundMs: Math.sqrt(GAMMA_AIR * R_AIR * temperatureK),
    numberDensityCm3: (pressurePa / (BOLTZMANN_J_K * temperatureK)) * 1e-6,
  };
}

/** ISA pressure at -500 m, Pa: the highest pressure `pressureAltitudeM` accepts. */
export const ISA_MAX_PRESSURE_PA = isaPressureAt(ISA_MIN_ALTITUDE_M);
/** ISA pressure at 32 000 m, Pa: the lowest pressure `pressureAltitudeM` accepts. */
export const ISA_MIN_PRESSURE_PA = isaPressureAt(ISA_MAX_ALTITUDE_M);

/**
 * Pressure altitude (geopotential m) of a static pressure in Pa: the inverse of `isa(...).pressurePa`
 * for 868.02..107 478 Pa (32 000..-500 m). RangeError outside.
 */
export function pressureAltitudeM(pressurePa: number): number {
  if (!Number.isFinite(pressurePa) || pressurePa < ISA_MIN_PRESSURE_PA || pressurePa > ISA_MAX_PRESSURE_PA) {
    throw new RangeError(
      `The pressure must be between ${ISA_MIN_PRESSURE_PA.toFixed(2)} and ${ISA_MAX_PRESSURE_PA.toFixed(0)} Pa (got ${pressurePa}).`,
    );
  }
  return isaPressureAltitudeAt(pressurePa);
}

/** Metres per flight level (100 ft = 30.48 m exactly). */
export const METRES_PER_FLIGHT_LEVEL = 30.48;

/**
 * Pressure altitude in metres of a flight level (hundreds of feet on 1013.25 hPa): FL x 30.48.
 * Accepts any flight level whose altitude lies in -500..32 000 m; RangeError outside.
 */
export function flightLevelToMetres(flightLevel: number): number {
  const h = flightLevel * METRES_PER_FLIGHT_LEVEL;
  checkAltitude(h, 'The flight level altitude');
  return h;
}

/** Geopotential altitude (m) from geometric altitude (m): H = r0 Z / (r0 + Z), r0 = 6 356 766 m. */
export function geopotentialFromGeometricM(geometricM: number): number {
  return (R0_EARTH_M * geometricM) / (R0_EARTH_M + geometricM);
}

/** Geometric altitude (m) from geopotential altitude (m): Z = r0 H / (r0 - H). */
export function geometricFromGeopotentialM(geopotentialM: number): number {
  return (R0_EARTH_M * geopotentialM) / (R0_EARTH_M - geopotentialM);
}
