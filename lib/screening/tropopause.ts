/**
 * Tropopause: the latitude-season climatology (Mateus, Mendes & Pires 2022, lookup-table model, placed
 * in pressure through the AFGL 1986 column) and the WMO (1957) lapse-rate tropopause of a sounding.
 */
import { G0, R_AIR, isaPressureAltitudeAt, isaPressureAt } from './atmosphere';
import {
  COLUMNS,
  bthGeopotentialM,
  bthHeightKm,
  bthRowForDay,
  placeInColumn,
  type ClimatologicalTropopause,
} from './climatology';
import { profileSlotFor } from './ozone-loss';
import { ScreeningInputError } from './errors';
import {
  soundingLevelProblems,
  soundingSetProblems,
  type FieldProblem,
  type SoundingLevelInput,
} from '../validation/screening';

/**
 * Mateus, Mendes & Pires (2022), Remote Sensing 14, 4303 (doi:10.3390/rs14174303), sigmoid model
 * (STH), 3.5 PVU blend, coefficients (a0..a5) as in the authors' published code (`sth_model.py`,
 * checked value by value). Northern hemisphere (lat > 0). Kept for comparison only: its seasonal
 * term is +/-0.13 km in one phase for both hemispheres, so the engine uses the same authors'
 * lookup-table model (climatology.ts) instead.
 */
export const MATEUS_2022_NORTH = Object.freeze([8.499, 7.8229, 26.7284, -1.5804, 0.098, -0.1257] as const);
/** Southern hemisphere and equator (lat <= 0) coefficients, same source. */
export const MATEUS_2022_SOUTH = Object.freeze([8.7796, 7.5417, -26.73, 1.1474, 0.087, -0.1255] as const);

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
/** Mid-month day of year (non-leap year), index 0 = January: the day the month's climatology uses. */
export const MID_MONTH_DAY_OF_YEAR: readonly number[] = Object.freeze(
  MONTH_DAYS.map((d, i) => MONTH_DAYS.slice(0, i).reduce((s, x) => s + x, 0) + (d + 1) / 2),
);

/** The sigmoid model's seasonal term a5 cos(2 pi (doy - 28) / 365.25) in km of one hemisphere; 0 for `null`. */
export function mateusSeasonalKm(northern: boolean, dayOfYear: number | null): number {
  if (dayOfYear === null) return 0;
  const a5 = northern ? MATEUS_2022_NORTH[5] : MATEUS_2022_SOUTH[5];
  return a5 * Math.cos((2 * Math.PI * (dayOfYear - 28)) / 365.25);
}

/** The sigmoid model's tropopause height, geometric km (comparison only; the engine uses the BTH table). */
export function mateusSigmoidKm(latDeg: number, dayOfYear: number | null): number {
  const a = latDeg > 0 ? MATEUS_2022_NORTH : MATEUS_2022_SOUTH;
  return a[0] + a[1] / Math.pow(1 + Math.exp(-(latDeg - a[2]) / a[3]), a[4]) + mateusSeasonalKm(latDeg > 0, dayOfYear);
}

function checkLatitude(latitudeDeg: number): void {
  if (!Number.isFinite(latitudeDeg) || latitudeDeg < -90 || latitudeDeg > 90) {
    throw new RangeError(`The latitude must be between -90 and 90 degrees (got ${latitudeDeg}).`);
  }
}

function checkMonth(month: number | null): void {
  if (month !== null && !(Number.isInteger(month) && month >= 1 && month <= 12)) {
    throw new RangeError(`The month must be a whole number 1-12 or null (got ${month}).`);
  }
}

function checkDay(dayOfYear: number | null): void {
  if (dayOfYear !== null && !(Number.isFinite(dayOfYear) && dayOfYear >= 0 && dayOfYear <= 367)) {
    throw new RangeError(`The day of year must be 1-366 or null (got ${dayOfYear}).`);
  }
}

/**
 * Climatological tropopause at `latitudeDeg` (-90..90) for `month` (1-12, the mid-month day) or
 * `null` (annual mean): Mateus, Mendes & Pires (2022) lookup-table model, 3.5 PVU table. Datum: the
 * model's geometric height converted to geopotential altitude (H = r0 Z / (r0 + Z)); a height, NOT a
 * pressure altitude: to compare with flight levels use `climatologicalTropopause(...).pressureAltitudeM`.
 * RangeError on bad arguments.
 */
export function climatologicalTropopauseM(latitudeDeg: number, month: number | null): number {
  checkLatitude(latitudeDeg);
  checkMonth(month);
  return climatologicalTropopauseForDayM(latitudeDeg, month === null ? null : MID_MONTH_DAY_OF_YEAR[month - 1]);
}

/**
 * As `climatologicalTropopauseM` for a day of year (1-366, fractional allowed) or `null` (annual
 * mean). Same datum: geopotential altitude of the model's geometric height, not a pressure altitude.
 */
export function climatologicalTropopauseForDayM(latitudeDeg: number, dayOfYear: number | null): number {
  checkLatitude(latitudeDeg);
  checkDay(dayOfYear);
  return bthGeopotentialM(bthHeightKm(bthRowForDay(dayOfYear), latitudeDeg));
}

/**
 * The climatological tropopause (Mateus et al. 2022 lookup-table model, 3.5 PVU) placed in the
 * climatological column of its latitude band and season (AFGL 1986 tropical, mid-latitude or
 * subarctic summer/winter, the mean of summer and winter without a month):
 * `{ geometricHeightM, pressureHpa, pressureAltitudeM }`, the last an ISA pressure altitude
 * comparable with a flight level's. RangeError on bad arguments.
 */
export function climatologicalTropopause(latitudeDeg: number, month: number | null): ClimatologicalTropopause {
  checkLatitude(latitudeDeg);
  checkMonth(month);
  const doy = month === null ? null : MID_MONTH_DAY_OF_YEAR[month - 1];
  return placeInColumn(COLUMNS[profileSlotFor(latitudeDeg, month)], bthHeightKm(bthRowForDay(doy), latitudeDeg));
}

/** The WMO first tropopause of a sounding. */
export interface SoundingTropopause {
  /** Altitude of the tropopause in the sounding's own heights (geopotential m). */
  altitudeM: number;
  /** Temperature at the tropopause, K. */
  temperatureK: number;
  /** Pressure at the tropopause, hPa. */
  pressureHpa: number;
}

/** A sounding with every level's altitude (geopotential m), pressure (Pa) and temperature (K), rising. */
export interface SoundingProfile {
  altitudeM: Float64Array;
  pressurePa: Float64Array;
  temperatureK: Float64Array;
}

/** Search for the lapse-rate tropopause only above this pressure, Pa (operational practice). */
export const WMO_SEARCH_TOP_OF_PRESSURE_PA = 50_000;
/** WMO (1957) threshold lapse rate, K per m. */
export const WMO_LAPSE_RATE_K_PER_M = 0.002;
/** WMO (1957) depth over which the average lapse rate must stay at or below the threshold, m. */
export const WMO_DEPTH_M = 2000;

function hypsometricThickness(p1: number, t1: number, p2: number, t2: number): number {
  return ((R_AIR * 0.5 * (t1 + t2)) / G0) * Math.log(p1 / p2);
}

/**
 * Completes and sorts a validated sounding: altitudes from pressure by the hypsometric equation
 * (layer-mean temperature) anchored on a level that has both, else on the ISA pressure altitude of
 * the highest-pressure level; pressures for altitude-only levels likewise from the nearest level
 * with both (or from ISA at the lowest level when no level has a pressure).
 */
export function completeSounding(levels: readonly SoundingLevelInput[], path: string): SoundingProfile {
  const n = levels.length;
  const z = new Float64Array(n).fill(Number.NaN);
  const p = new Float64Array(n).fill(Number.NaN);
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const l = levels[i];
    t[i] = l.temperatureK;
    if (l.altitudeM !== undefined) z[i] = l.altitudeM;
    if (l.pressureHpa !== undefined) p[i] = l.pressureHpa * 100;
  }
  const byPressure: number[] = [];
  for (let i = 0; i < n; i++) if (!Number.isNaN(p[i])) byPressure.push(i);
  byPressure.sort((a, b) => p[b] - p[a]);
  if (byPressure.length > 0) {
    let anchor = byPressure.findIndex((i) => !Number.isNaN(z[i]));
    if (anchor < 0) {
      anchor = 0;
      z[byPressure[0]] = isaPressureAltitudeAt(p[byPressure[0]]);
    }
    for (let k = anchor + 1; k < byPressure.length; k++) {
      const i = byPressure[k];
      const j = byPressure[k - 1];
      if (Number.isNaN(z[i])) z[i] = z[j] + hypsometricThickness(p[j], t[j], p[i], t[i]);
    }
    for (let k = anchor - 1; k >= 0; k--) {
      const i = byPressure[k];
      const j = byPressure[k + 1];
      if (Number.isNaN(z[i])) z[i] = z[j] - hypsometricThickness(p[i], t[i], p[j], t[j]);
    }
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => z[a] - z[b]);
  let firstKnown = order.findIndex((i) => !Number.isNaN(p[i]));
  if (firstKnown < 0) {
    firstKnown = 0;
    p[order[0]] = isaPressureAt(z[order[0]]);
  }
  for (let k = firstKnown + 1; k < n; k++) {
    const i = order[k];
    const j = order[k - 1];
    if (Number.isNaN(p[i])) p[i] = p[j] * Math.exp((-G0 * (z[i] - z[j])) / (R_AIR * 0.5 * (t[i] + t[j])));
  }
  for (let k = firstKnown - 1; k >= 0; k--) {
    const i = order[k];
    const j = order[k + 1];
    if (Number.isNaN(p[i])) p[i] = p[j] * Math.exp((G0 * (z[j] - z[i])) / (R_AIR * 0.5 * (t[i] + t[j])));
  }
  const out: SoundingProfile = {
    altitudeM: new Float64Array(n),
    pressurePa: new Float64Array(n),
    temperatureK: new Float64Array(n),
  };
  const problems: FieldProblem[] = [];
  for (let k = 0; k < n; k++) {
    const i = order[k];
    out.altitudeM[k] = z[i];
    out.pressurePa[k] = p[i];
    out.temperatureK[k] = t[i];
    if (k > 0 && !(z[i] > out.altitudeM[k - 1] && p[i] < out.pressurePa[k - 1])) {
      problems.push({
        path: `${path}.${i}`,
        message: 'This level does not fit between its neighbours: altitudes must rise as pressures fall.',
      });
    }
  }
  if (problems.length > 0) throw new ScreeningInputError(problems);
  return out;
}

function interpolateAt(profile: SoundingProfile, zTarget: number): { t: number; p: number } {
  const zs = profile.altitudeM;
  let k = 0;
  while (k < zs.length - 2 && zTarget > zs[k + 1]) k++;
  const f = (zTarget - zs[k]) / (zs[k + 1] - zs[k]);
  const t = profile.temperatureK[k] + f * (profile.temperatureK[k + 1] - profile.temperatureK[k]);
  const p = Math.exp(
    Math.log(profile.pressurePa[k]) + f * (Math.log(profile.pressurePa[k + 1]) - Math.log(profile.pressurePa[k])),
  );
  return { t, p };
}

/**
 * WMO (1957) first tropopause of a completed profile. Temperature is taken as linear in height
 * between levels, so each layer has one lapse rate and the lowest level where it falls to 2 K/km or
 * less is a level (or the 500 hPa point inside a layer); the 2 km condition is tested at every
 * level within 2 km above it and at the point exactly 2 km above (interpolated), which for a
 * piecewise-linear profile is where the extremes of the average lapse rate lie. A candidate with less
 * than 2 km of sounding above it cannot be confirmed: the search ends there and returns null.
 */
export function wmoTropopause(profile: SoundingProfile): SoundingTropopause | null {
  const zs = profile.altitudeM;
  const ts = profile.temperatureK;
  const ps = profile.pressurePa;
  const n = zs.length;
  const tol = 1e-9;
  for (let i = 0; i < n - 1; i++) {
    if (ps[i + 1] > WMO_SEARCH_TOP_OF_PRESSURE_PA) continue;
    const lapse = -(ts[i + 1] - ts[i]) / (zs[i + 1] - zs[i]);
    if (lapse > WMO_LAPSE_RATE_K_PER_M) continue;
    let zc = zs[i];
    let tc = ts[i];
    let pc = ps[i];
    if (ps[i] > WMO_SEARCH_TOP_OF_PRESSURE_PA) {
      const f = Math.log(ps[i] / WMO_SEARCH_TOP_OF_PRESSURE_PA) / Math.log(ps[i] / ps[i + 1]);
      zc = zs[i] + f * (zs[i + 1] - zs[i]);
      tc = ts[i] + f * (ts[i + 1] - ts[i]);
      pc = WMO_SEARCH_TOP_OF_PRESSURE_PA;
    }
    if (zs[n - 1] < zc + WMO_DEPTH_M) return null;
    let ok = true;
    for (let j = i + 1; j < n && zs[j] <= zc + WMO_DEPTH_M; j++) {
      if (zs[j] > zc && (tc - ts[j]) / (zs[j] - zc) > WMO_LAPSE_RATE_K_PER_M + tol) {
        ok = false;
        break;
      }
    }
    if (ok) {
      const top = interpolateAt(profile, zc + WMO_DEPTH_M);
      if ((tc - top.t) / WMO_DEPTH_M > WMO_LAPSE_RATE_K_PER_M + tol) ok = false;
    }
    if (ok) return { altitudeM: zc, temperatureK: tc, pressureHpa: pc / 100 };
  }
  return null;
}

/** Temperature (K) of a completed profile at pressure `pressurePa`, linear in ln p; null outside it. */
export function soundingTemperatureAtPressure(profile: SoundingProfile, pressurePa: number): number | null {
  const ps = profile.pressurePa;
  const n = ps.length;
  if (!(pressurePa <= ps[0] && pressurePa >= ps[n - 1])) return null;
  let k = 0;
  while (k < n - 2 && pressurePa < ps[k + 1]) k++;
  const f = Math.log(ps[k] / pressurePa) / Math.log(ps[k] / ps[k + 1]);
  return profile.temperatureK[k] + f * (profile.temperatureK[k + 1] - profile.temperatureK[k]);
}

/** Checks levels given as any value; throws ScreeningInputError with paths under `path`. */
export function checkSounding(levels: unknown, path: string): SoundingLevelInput[] {
  if (!Array.isArray(levels)) {
    throw new ScreeningInputError([{ path, message: 'A sounding must be a list of levels.' }]);
  }
  const problems: FieldProblem[] = [];
  for (let i = 0; i < levels.length; i++) problems.push(...soundingLevelProblems(levels[i], `${path}.${i}`));
  problems.push(...soundingSetProblems(levels, path));
  if (problems.length > 0) throw new ScreeningInputError(problems);
  return levels as SoundingLevelInput[];
}

/**
 * WMO (1957) first lapse-rate tropopause of a sounding. `levels`: `{ altitudeM?, pressureHpa?,
 * temperatureK }[]` in any order, each with an altitude (geopotential m) or a pressure (hPa) or
 * both; altitudes from pressures by the hypsometric equation when missing. Searched above 500 hPa.
 * Returns `{ altitudeM, temperatureK, pressureHpa }` or `null` when the sounding has none. Throws
 * ScreeningInputError (paths `levels.N.field`) for fewer than 3 levels, duplicates or non-physical
 * values (T <= 100 K or >= 350 K, p <= 0).
 */
export function tropopauseFromSounding(levels: readonly SoundingLevelInput[]): SoundingTropopause | null {
  const checked = checkSounding(levels, 'levels');
  return wmoTropopause(completeSounding(checked, 'levels'));
}
