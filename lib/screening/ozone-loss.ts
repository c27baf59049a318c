/**
 * The ozone-loss screening figure: gross catalytic odd-oxygen destruction by NOx
 * injected above the tropopause, with a deliberately wide low-high band, a local chain length, a
 * local odd-oxygen loss budget and the fleet-scale column context of published supersonic studies.
 * Number densities in molecule cm^-3, J in s^-1, residence times in years, masses in kg.
 */
import { AVOGADRO, BOLTZMANN_J_K } from './atmosphere';
import { COLUMNS, columnAtPressure } from './climatology';
import {
  JPL_19_5,
  arrhenius,
  lowPressureLimit,
  no2ORate,
  ohNo2Rate,
  type ArrheniusParameters,
  type TermolecularParameters,
} from './kinetics';
import type { Assumptions, OzoneProfileName } from '../validation/screening';

/** Molar mass of O3, g/mol. */
export const MOLAR_MASS_O3 = 47.998;
/** Molar mass of NO2, g/mol: NOx mass is NO2-equivalent throughout. */
export const MOLAR_MASS_NO2 = 46.0055;
/** Molar mass of N, g/mol. */
export const MOLAR_MASS_N = 14.0067;
/** O2 volume fraction of dry air. */
export const O2_FRACTION = 0.2095;
/** Seconds in a Julian year. */
export const SECONDS_PER_YEAR = 365.25 * 86_400;

/** Source line of the embedded ozone profiles. */
export const AFGL_SOURCE =
  'AFGL 1986 constituent profiles (Anderson et al. 1986, AFGL-TR-86-0110, tables 1a-1e), O3 in ppmv, 0-35 km';

/** Geometric altitudes (km) of the embedded AFGL O3 grid: 0-25 km by 1 km, then 27.5-35 km. */
export const AFGL_ALTITUDE_KM: readonly number[] = Object.freeze([
  0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20, 21, 22, 23, 24, 25, 27.5, 30, 32.5, 35,
]);

// The O3 column (ppmv) of five of the six model atmospheres of Anderson et al. (1986),
// AFGL-TR-86-0110, tables 1a-1e, on their grid up to 35 km. Checked value by value against two
// machine-readable transcriptions of those tables (see tests/unit/screening/ozone-loss.test.ts).
/** O3 volume mixing ratio (ppmv) on AFGL_ALTITUDE_KM for each embedded profile. */
export const AFGL_O3_PPMV: Readonly<Record<OzoneProfileName, readonly number[]>> = Object.freeze({
  tropical: [
    0.02869, 0.0315, 0.03342, 0.03504, 0.03561, 0.03767, 0.03989, 0.04223, 0.04471, 0.05, 0.05595, 0.06613, 0.07815,
    0.09289, 0.105, 0.1256, 0.1444, 0.25, 0.5, 0.95, 1.4, 1.8, 2.4, 3.4, 4.3, 5.4, 7.8, 9.3, 9.85, 9.7,
  ],
  'midlatitude-summer': [
    0.03017, 0.03337, 0.03694, 0.04222, 0.04821, 0.05512, 0.06408, 0.07764, 0.09126, 0.1111, 0.1304, 0.1793, 0.223, 0.3,
    0.44, 0.5, 0.6, 0.7, 1.0, 1.5, 2.0, 2.4, 2.9, 3.4, 4.0, 4.8, 6.0, 7.0, 8.1, 8.9,
  ],
  'midlatitude-winter': [
    0.02778, 0.028, 0.02849, 0.032, 0.03567, 0.0472, 0.05837, 0.07891, 0.1039, 0.1567, 0.237, 0.3624, 0.5232, 0.7036,
    0.8, 0.9, 1.1, 1.4, 1.8, 2.3, 2.9, 3.5, 3.9, 4.3, 4.7, 5.1, 5.6, 6.1, 6.8, 7.1,
  ],
  'subarctic-summer': [
    0.02412, 0.0294, 0.03379, 0.03887, 0.04478, 0.05328, 0.06564, 0.07738, 0.09114, 0.142, 0.189, 0.305, 0.41, 0.5, 0.6,
    0.7, 0.85, 1.0, 1.3, 1.7, 2.1, 2.7, 3.3, 3.7, 4.2, 4.5, 5.3, 5.7, 6.9, 7.7,
  ],
  'subarctic-winter': [
    0.01802, 0.02072, 0.02336, 0.02767, 0.03253, 0.03801, 0.04446, 0.07252, 0.104, 0.21, 0.3, 0.35, 0.4, 0.65, 0.9, 1.2,
    1.5, 1.9, 2.45, 3.1, 3.7, 4.0, 4.2, 4.5, 4.6, 4.7, 4.9, 5.4, 5.9, 6.2,
  ],
});

/** |Latitude| (degrees) below which the tropical profile is used all year. */
export const TROPICAL_BAND_MAX_LAT = 23.5;
/** |Latitude| (degrees) from which the subarctic profiles are used. */
export const SUBARCTIC_BAND_MIN_LAT = 50;

/** Profile slots the engine caches by: the five AFGL profiles, two annual means, one custom. */
export const PROFILE_SLOTS = [
  'tropical',
  'midlatitude-summer',
  'midlatitude-winter',
  'subarctic-summer',
  'subarctic-winter',
  'midlatitude-annual-mean',
  'subarctic-annual-mean',
  'custom',
] as const;
/** Name of a profile slot. */
export type ProfileSlotName = (typeof PROFILE_SLOTS)[number];
/** Index of the user-supplied profile in PROFILE_SLOTS. */
export const CUSTOM_PROFILE_SLOT = 7;

/**
 * Profile slot for a latitude (degrees) and month (1-12, or null for the annual mean): tropical for
 * |lat| < 23.5 all year, mid-latitude for 23.5-50, subarctic poleward of 50; summer is April-September
 * in the north and October-March in the south; with no month the mean of summer and winter.
 */
export function profileSlotFor(latDeg: number, month: number | null): number {
  const a = latDeg < 0 ? -latDeg : latDeg;
  if (a < TROPICAL_BAND_MAX_LAT) return 0;
  const sub = a >= SUBARCTIC_BAND_MIN_LAT;
  if (month === null) return sub ? 6 : 5;
  const northSummer = month >= 4 && month <= 9;
  const summer = latDeg >= 0 ? northSummer : !northSummer;
  return sub ? (summer ? 3 : 4) : summer ? 1 : 2;
}

function interpolateProfile(altKm: readonly number[], ppmv: readonly number[], zKm: number): number {
  const n = altKm.length;
  if (zKm <= altKm[0]) return ppmv[0];
  if (zKm >= altKm[n - 1]) return ppmv[n - 1];
  let i = 0;
  while (zKm > altKm[i + 1]) i++;
  const f = (zKm - altKm[i]) / (altKm[i + 1] - altKm[i]);
  return ppmv[i] + f * (ppmv[i + 1] - ppmv[i]);
}

/**
 * O3 volume mixing ratio (ppmv) of a profile slot at geometric altitude `zKm`, linear between grid
 * points and constant beyond the ends. Annual-mean slots average summer and winter.
 */
export function ozonePpmv(
  slot: number,
  zKm: number,
  custom?: { altitudeKm: readonly number[]; ppmv: readonly number[] },
): number {
  if (slot === CUSTOM_PROFILE_SLOT) {
    if (custom === undefined) throw new RangeError('The custom ozone profile is missing.');
    return interpolateProfile(custom.altitudeKm, custom.ppmv, zKm);
  }
  if (slot === 5) {
    return 0.5 * (ozonePpmv(1, zKm) + ozonePpmv(2, zKm));
  }
  if (slot === 6) {
    return 0.5 * (ozonePpmv(3, zKm) + ozonePpmv(4, zKm));
  }
  const name = PROFILE_SLOTS[slot] as OzoneProfileName;
  return interpolateProfile(AFGL_ALTITUDE_KM, AFGL_O3_PPMV[name], zKm);
}

/** A value with its screening band. */
export interface Band {
  central: number;
  low: number;
  high: number;
}

/** The inputs of the ozone figure after defaults and overrides are merged. */
export interface OzoneInputs {
  /** J(O3 -> O(3P)) with the sun overhead, s^-1; scaled by the daytime-mean cos zenith. */
  jO3NoonPerS: Band;
  /** J(NO2) with the sun overhead, s^-1; scaled likewise. */
  jNo2NoonPerS: Band;
  /** Daylight factor D given with the flight, or null: derived from solar geometry. */
  daylightFactor: Band | null;
  noxToNoyFraction: Band;
  residenceTime: ResidenceTimeTable;
  ohCm3: number;
  ho2Cm3: number;
  relativeHumidity: number;
  /** Fixed profile name, a custom profile, or null for the band-and-season choice. */
  ozoneProfile: OzoneProfileName | { altitudeKm: readonly number[]; ppmv: readonly number[] } | null;
}

/**
 * Residence time above the tropopause by depth (nodes in km, first 0) for the extratropics
 * (`years`) and the tropics (`tropicalYears`, null: the extratropical values everywhere), with the
 * band factors of the low and high figures.
 */
export interface ResidenceTimeTable {
  depthKm: readonly number[];
  years: readonly number[];
  tropicalYears: readonly number[] | null;
  lowFactor: number;
  highFactor: number;
}

/** The sunlit fraction of the day at an equinox, everywhere: a placeholder for forms, not a default. */
export const DAYLIGHT_FACTOR_EQUINOX: Readonly<Band> = Object.freeze({ central: 0.5, low: 0.5, high: 0.5 });

/** |Latitude| up to which the tropical residence times apply in full, degrees. */
export const TROPICAL_RESIDENCE_FULL_LAT = 20;
/** |Latitude| from which the extratropical residence times apply in full (linear between), degrees. */
export const EXTRATROPICAL_RESIDENCE_FULL_LAT = 30;

/** Sources of the residence-time defaults, shown beside the values. */
export const RESIDENCE_SOURCE =
  'E-folding (mean) residence above the tropopause; no table by latitude and depth was found in the sources below, so the node values are read from their descriptions (screening values). Extratropics, 0.1 yr at the tropopause to 2 yr at 9 km above: emissions near the extratropical tropopause are flushed within weeks to months and stay 1-2 years at 16-20 km (IPCC 1999, Aviation and the Global Atmosphere, ch. 2 and 4; the lowermost stratosphere is flushed within months, Holton et al. 1995, Rev. Geophys. 33, 403); aircraft emissions deposited in the stratosphere stay about 50 days, shorter in January than July (Gettelman 1999, PhD thesis, University of Washington), between the 0 km and 1 km nodes (36 and 91 days); a single e-folding time fits emissions near the tropopause and underweights those far above it (Wilcox, Shine & Hoskins 2012, Atmos. Environ. 63, 1). Tropics, 1 yr at the tropopause to 3 yr at 6-9 km above: NOx is lofted by the Brewer-Dobson upwelling; mean age of air is about 1 yr at 20 km over the equator and 4-5 yr at high latitudes (Waugh & Hall 2002, Rev. Geophys. 40, 1010, and their zonal-mean schematic), and residence time runs against age (a near-uniform total transit time at each altitude; Observing stratospheric residence time from opposing transport timescales, Research Square preprint 10.21203/rs.3.rs-9087641/v1), so tropical injections stay longest. At most 5 yr: the slowest decay mode of the whole stratosphere is 3.8-5.3 yr (Ehhalt, Rohrer, Schauffler & Prather 2004, J. Geophys. Res. 109). Override with a published table where one is adopted (e.g. the EMAC idealised-tracer residence times by latitude and altitude, Pletzer 2026, Zenodo 10.5281/zenodo.17484648).';

/**
 * Defaults: screening values of the right order of magnitude, given from memory; each is
 * overridable through `input.assumptions`. The J values are overhead-sun references scaled by the
 * daytime-mean cos of the zenith angle (a screening approximation). [HO2] is 5 x [OH] (from memory,
 * lower stratosphere daytime) and only used by the local budget. Relative humidity 0.6 (BFFM2 default).
 */
export const DEFAULT_OZONE_INPUTS: Readonly<OzoneInputs> = Object.freeze({
  jO3NoonPerS: Object.freeze({ central: 4.5e-4, low: 3e-4, high: 6e-4 }),
  jNo2NoonPerS: Object.freeze({ central: 1.0e-2, low: 0.8e-2, high: 1.5e-2 }),
  daylightFactor: null,
  noxToNoyFraction: Object.freeze({ central: 0.2, low: 0.1, high: 0.4 }),
  residenceTime: Object.freeze({
    depthKm: Object.freeze([0, 1, 2, 4, 6, 9]),
    // Extratropics (RESIDENCE_SOURCE): 0.1 yr = "weeks to months" at the tropopause (IPCC 1999 ch. 2
    // and 4; Holton et al. 1995), with 0.1-0.25 yr at 0-1 km bracketing the about 50 days of aircraft
    // emissions in the stratosphere (Gettelman 1999); 1.0-2.0 yr at 4-9 km above, i.e. 14-20 km over a 10-11 km
    // tropopause = "1-2 years at 16-20 km" (IPCC 1999 ch. 4); between, linear in the sense of
    // Wilcox et al. 2012 (longer than one e-folding far above the tropopause). Read from descriptions.
    years: Object.freeze([0.1, 0.25, 0.5, 1.0, 1.5, 2.0]),
    // Tropics (RESIDENCE_SOURCE): 1 yr at the tropopause (tropical mean age about 1 yr at 20 km,
    // Waugh & Hall 2002, with residence running against age) to 3 yr at 6-9 km above, below the 5 yr
    // bound of the slowest stratospheric mode (Ehhalt et al. 2004). Read from descriptions.
    tropicalYears: Object.freeze([1.0, 1.5, 2.0, 2.5, 3.0, 3.0]),
    lowFactor: 0.5,
    highFactor: 2,
  }),
  ohCm3: 1e6,
  ho2Cm3: 5e6,
  relativeHumidity: 0.6,
  ozoneProfile: null,
});

function band(v: number | Band | undefined, d: Band): Band {
  if (v === undefined) return d;
  if (typeof v === 'number') return { central: v, low: v, high: v };
  return v;
}

function sameNodes(a: readonly number[], b: readonly number[]): boolean {
  return a.length === b.length && a.every((x, i) => x === b[i]);
}

/**
 * Merges validated overrides into the defaults. A residence-time override without `tropicalYears`
 * keeps the default tropical table when it uses the default depth nodes, else applies everywhere.
 * Returns the shared default object when none.
 */
export function resolveOzoneInputs(a: Assumptions | undefined): OzoneInputs {
  if (a === undefined) return DEFAULT_OZONE_INPUTS;
  const d = DEFAULT_OZONE_INPUTS;
  const rt = a.residenceTime;
  return {
    jO3NoonPerS: band(a.jO3NoonPerS, d.jO3NoonPerS),
    jNo2NoonPerS: band(a.jNo2NoonPerS, d.jNo2NoonPerS),
    daylightFactor: a.daylightFactor === undefined ? null : band(a.daylightFactor, { central: 0, low: 0, high: 0 }),
    noxToNoyFraction: band(a.noxToNoyFraction, d.noxToNoyFraction),
    residenceTime:
      rt === undefined
        ? d.residenceTime
        : {
            depthKm: rt.depthKm,
            years: rt.years,
            tropicalYears:
              rt.tropicalYears ??
              (sameNodes(rt.depthKm, d.residenceTime.depthKm) ? d.residenceTime.tropicalYears : null),
            lowFactor: rt.lowFactor ?? d.residenceTime.lowFactor,
            highFactor: rt.highFactor ?? d.residenceTime.highFactor,
          },
    ohCm3: a.ohCm3 ?? d.ohCm3,
    ho2Cm3: a.ho2Cm3 ?? d.ho2Cm3,
    relativeHumidity: a.relativeHumidity ?? d.relativeHumidity,
    ozoneProfile: a.ozoneProfile ?? null,
  };
}

function interpolateNodes(xs: readonly number[], ys: readonly number[], x: number): number {
  const n = xs.length;
  if (x <= xs[0]) return ys[0];
  if (x >= xs[n - 1]) return ys[n - 1];
  let i = 0;
  while (x > xs[i + 1]) i++;
  return ys[i] + ((x - xs[i]) / (xs[i + 1] - xs[i])) * (ys[i + 1] - ys[i]);
}

/**
 * Residence time above the tropopause (years, central) at `depthKm` above it and latitude
 * `latDeg`: linear in depth between the nodes (at the lower edge of each depth band, flat beyond
 * the last node and at the first value below 0 km, so never less than a band's value inside it);
 * the tropical table up to 20 degrees, the extratropical one from 30 degrees, linear between.
 */
export function residenceTimeYears(depthKm: number, r: ResidenceTimeTable, latDeg = 90): number {
  const extra = interpolateNodes(r.depthKm, r.years, depthKm);
  if (r.tropicalYears === null) return extra;
  const a = latDeg < 0 ? -latDeg : latDeg;
  if (a >= EXTRATROPICAL_RESIDENCE_FULL_LAT) return extra;
  const trop = interpolateNodes(r.depthKm, r.tropicalYears, depthKm);
  if (a <= TROPICAL_RESIDENCE_FULL_LAT) return trop;
  const w = (a - TROPICAL_RESIDENCE_FULL_LAT) / (EXTRATROPICAL_RESIDENCE_FULL_LAT - TROPICAL_RESIDENCE_FULL_LAT);
  return trop + w * (extra - trop);
}

const K_NO_O3 = JPL_19_5['NO+O3'] as ArrheniusParameters;
const K_O_O3 = JPL_19_5['O+O3'] as ArrheniusParameters;
const K_OH_O3 = JPL_19_5['OH+O3'] as ArrheniusParameters;
const K_HO2_O = JPL_19_5['HO2+O'] as ArrheniusParameters;
const K_HO2_O3 = JPL_19_5['HO2+O3'] as ArrheniusParameters;
const K_O_O2_M = JPL_19_5['O+O2+M'] as TermolecularParameters;

/** Air number density (molecule cm^-3) from pressure (Pa) and temperature (K). */
export function airNumberDensityCm3(pressurePa: number, temperatureK: number): number {
  return (pressurePa / (BOLTZMANN_J_K * temperatureK)) * 1e-6;
}

/**
 * Temperature (K), air number density (molecule cm^-3) and geometric height (km) for the chemistry at
 * pressure `pressurePa` in profile slot `slot`'s climatological column. A sounding's own temperature
 * wins over the column's; a custom profile (no column) takes `levelTemperatureK` and `customHeightKm`.
 * The engine and the uncertainty sampling both read the chemistry through this one function.
 */
export function chemistryAt(
  pressurePa: number,
  slot: number,
  levelTemperatureK: number,
  fromSounding: boolean,
  customHeightKm: number,
): { t: number; m: number; zKm: number } {
  if (slot === CUSTOM_PROFILE_SLOT) {
    return { t: levelTemperatureK, m: airNumberDensityCm3(pressurePa, levelTemperatureK), zKm: customHeightKm };
  }
  const c = columnAtPressure(COLUMNS[slot], pressurePa);
  if (fromSounding) {
    return { t: levelTemperatureK, m: airNumberDensityCm3(pressurePa, levelTemperatureK), zKm: c.heightKm };
  }
  return { t: c.temperatureK, m: c.airDensityCm3, zKm: c.heightKm };
}

/** Length of the coefficient block `ozoneLossCoefficients` writes. */
export const COEFFICIENT_COUNT = 7;

/**
 * Per-NOx-molecule loss coefficients at one level, written into `out` (length COEFFICIENT_COUNT),
 * for a daytime-mean cos zenith s and daylight factor D supplied later by `lossPerNoxYear`:
 * out[0..2] = B (central, low, high) and out[3..5] = r0 such that the O3 molecules destroyed per NOx
 * molecule per year of residence are B s D / (s + r0). With [O] = s J(O3) [O3] / (k(O+O2+M) [O2] [M])
 * and [NO2]/[NO] = k(NO+O3)[O3] / (s J(NO2) + k(NO2+O)[O]) = r0 / s, the loss 2 k(NO2+O) [O] D f_NO2
 * f_NOx/NOy x seconds per year takes that form. The low case takes J(O3), f_NOx/NOy and the residence
 * factor low and J(NO2) high; the high case the reverse, so low <= central <= high.
 * out[6] = local daytime chain length per unit s, k(NO2+O)[O] / (k(OH+NO2+M)[OH]) at s = 1.
 */
export function ozoneLossCoefficients(
  temperatureK: number,
  airDensityCm3: number,
  o3Ppmv: number,
  inputs: OzoneInputs,
  out: Float64Array,
): void {
  const m = airDensityCm3;
  const o3 = o3Ppmv * 1e-6 * m;
  const kNo2O = no2ORate(temperatureK, m);
  const kNoO3 = arrhenius(K_NO_O3.a, K_NO_O3.eOverRK, temperatureK);
  const k0 = lowPressureLimit(K_O_O2_M.k0At300, K_O_O2_M.n, temperatureK);
  const oPerJ = o3 / (k0 * O2_FRACTION * m * m);
  const j = inputs.jO3NoonPerS;
  const jn = inputs.jNo2NoonPerS;
  const f = inputs.noxToNoyFraction;
  const rt = inputs.residenceTime;
  const write = (k: number, jO3: number, jNo2: number, ff: number, factor: number): void => {
    const r0 = (kNoO3 * o3) / (jNo2 + kNo2O * oPerJ * jO3);
    out[k] = 2 * kNo2O * oPerJ * jO3 * r0 * ff * SECONDS_PER_YEAR * factor;
    out[k + 3] = r0;
  };
  write(0, j.central, jn.central, f.central, 1);
  write(1, j.low, jn.high, f.low, rt.lowFactor);
  write(2, j.high, jn.low, f.high, rt.highFactor);
  out[6] = (kNo2O * oPerJ * j.central) / (ohNo2Rate(temperatureK, m) * inputs.ohCm3);
}

/** O3 molecules destroyed per NOx molecule per year of residence for one case of the coefficients. */
export function lossPerNoxYear(c: Float64Array, k: 0 | 1 | 2, sunCos: number, daylight: number): number {
  const r0 = c[k + 3];
  const den = sunCos + r0;
  return den > 0 ? (c[k] * sunCos * daylight) / den : 0;
}

/** NOx molecules in `kg` of NO2-equivalent NOx. */
export function noxMolecules(kgNo2: number): number {
  return ((kgNo2 * 1000) / MOLAR_MASS_NO2) * AVOGADRO;
}

/** Mass (kg) of `molecules` of O3. */
export function ozoneKg(molecules: number): number {
  return ((molecules / AVOGADRO) * MOLAR_MASS_O3) / 1000;
}

/** The local odd-oxygen loss budget at one level (daytime photolysis), molecule cm^-3 s^-1. */
export interface OddOxygenBudget {
  altitudeM: number;
  latitudeDeg: number;
  ozoneProfile: ProfileSlotName;
  aboveTropopause: boolean;
  temperatureK: number;
  airDensityCm3: number;
  o3Cm3: number;
  /** Daytime atomic oxygen from the photostationary relation. */
  oCm3: number;
  ohCm3: number;
  ho2Cm3: number;
  /** Chapman loss 2 k(O+O3)[O][O3]. */
  chapmanLossCm3S: number;
  /** HOx cycles: k(OH+O3)[OH][O3] + k(HO2+O)[HO2][O] + k(HO2+O3)[HO2][O3]. */
  hoxLossCm3S: number;
  /** NOx cycle 2 k(NO2+O)[NO2][O] for 1 ppbv of added NOx (NO2 share from the photostationary state). */
  noxLossPer1PpbvCm3S: number;
  /** Share of the total loss that 1 ppbv of added NOx would carry. */
  addedNoxShareAt1Ppbv: number;
  note: string;
}

/**
 * Local odd-oxygen loss budget at the injection level: the added NOx cycle (per 1 ppbv of NOx)
 * beside the background Chapman (O + O3) and HOx (OH + O3, HO2 + O, HO2 + O3) losses, with daytime
 * photolysis (central J), rate constants JPL 19-5. Densities molecule cm^-3, rates cm^-3 s^-1.
 */
export function oddOxygenBudget(args: {
  altitudeM: number;
  latitudeDeg: number;
  profileSlot: number;
  aboveTropopause: boolean;
  temperatureK: number;
  airDensityCm3: number;
  o3Ppmv: number;
  inputs: OzoneInputs;
  /** Daytime-mean cos zenith the overhead-sun J values are scaled by (default 1). */
  sunCos?: number;
}): OddOxygenBudget {
  const { temperatureK: t, airDensityCm3: m, inputs } = args;
  const s = args.sunCos ?? 1;
  const o3 = args.o3Ppmv * 1e-6 * m;
  const k0 = lowPressureLimit(K_O_O2_M.k0At300, K_O_O2_M.n, t);
  const o = (o3 * inputs.jO3NoonPerS.central * s) / (k0 * O2_FRACTION * m * m);
  const kNo2O = no2ORate(t, m);
  const kNoO3 = arrhenius(K_NO_O3.a, K_NO_O3.eOverRK, t);
  const jNo2 = inputs.jNo2NoonPerS.central * s;
  const ratio = jNo2 + kNo2O * o > 0 ? (kNoO3 * o3) / (jNo2 + kNo2O * o) : 0;
  const fNo2 = ratio / (1 + ratio);
  const chapman = 2 * arrhenius(K_O_O3.a, K_O_O3.eOverRK, t) * o * o3;
  const oh = inputs.ohCm3;
  const ho2 = inputs.ho2Cm3;
  const hox =
    arrhenius(K_OH_O3.a, K_OH_O3.eOverRK, t) * oh * o3 +
    arrhenius(K_HO2_O.a, K_HO2_O.eOverRK, t) * ho2 * o +
    arrhenius(K_HO2_O3.a, K_HO2_O3.eOverRK, t) * ho2 * o3;
  const nox = 2 * kNo2O * (1e-9 * m * fNo2) * o;
  return {
    altitudeM: args.altitudeM,
    latitudeDeg: args.latitudeDeg,
    ozoneProfile: PROFILE_SLOTS[args.profileSlot],
    aboveTropopause: args.aboveTropopause,
    temperatureK: t,
    airDensityCm3: m,
    o3Cm3: o3,
    oCm3: o,
    ohCm3: oh,
    ho2Cm3: ho2,
    chapmanLossCm3S: chapman,
    hoxLossCm3S: hox,
    noxLossPer1PpbvCm3S: nox,
    addedNoxShareAt1Ppbv: nox + chapman + hox > 0 ? nox / (nox + chapman + hox) : 0,
    note: 'Daytime rates (overhead-sun J values scaled by the daytime-mean cos zenith of the flight date and place) at the level carrying the most NOx above the tropopause; 1 ppbv of added NOx is a yardstick, not the plume concentration. Background NOx and halogen cycles are not included.',
  };
}

/** A published fleet-scale study the context refers to. */
export interface FleetStudy {
  id: 'eastham-2022' | 'zhang-2023';
  citation: string;
  /** Geometric altitude band of the study's emissions, km. */
  altitudeKm: readonly [number, number];
  /** Annual NOx of the study, Tg per year (mass basis as the study reports it). */
  noxTgPerYear: number;
  /** Global column ozone change of the study, % (negative is a loss). */
  columnChangePct: number;
}

/** Eastham et al. 2022 and Zhang et al. 2023: published fleet-scale column-ozone results. */
export const FLEET_STUDIES: readonly FleetStudy[] = Object.freeze([
  {
    id: 'eastham-2022',
    citation:
      "Eastham et al. 2022, Environ. Sci.: Atmos. 2, 388 (response to all of the fleet's emissions: NOx, water, sulfur, soot; not NOx alone)",
    altitudeKm: [15, 17] as const,
    noxTgPerYear: 0.17,
    columnChangePct: -0.046,
  },
  {
    id: 'zhang-2023',
    citation: "Zhang et al. 2023, Earth's Future, e2022EF003409",
    altitudeKm: [17, 20] as const,
    noxTgPerYear: 1.78,
    columnChangePct: -0.74,
  },
]);

/** Half-width of the band put on the scaled study results (fraction): +/-50 %. */
export const FLEET_CONTEXT_BAND = 0.5;

/** Column context from one study for NOx within its altitudes. */
export interface FleetContextEntry {
  study: FleetStudy['id'];
  citation: string;
  altitudeKm: readonly [number, number];
  applicable: boolean;
  /** Annual NOx (kg/yr) falling inside the study's altitude band. */
  noxInBandKgPerYear: number;
  /** Global column ozone change (%) from scaling the study linearly: central, low, high (+/-50 %). */
  columnChangePct: Band | null;
  note: string;
}

/**
 * Fleet-scale column ozone context: annual NOx injected above the tropopause (kg NO2 per year) by
 * altitude (ISA geopotential m, converted to geometric for the comparison), scaled linearly on the
 * published study results of Eastham et al. 2022 (15-17 km) and Zhang et al. 2023 (17-20 km), with
 * a +/-50 % band. Only NOx inside a study's altitude band is scaled; a study with none there is
 * reported as not applicable. The studies' NOx mass basis must be checked against the papers.
 */
export function fleetOzoneColumnContext(
  annualNox: readonly { geometricAltitudeKm: number; noxKgPerYear: number }[],
): FleetContextEntry[] {
  return FLEET_STUDIES.map((s) => {
    let inBand = 0;
    for (const e of annualNox) {
      if (e.geometricAltitudeKm >= s.altitudeKm[0] && e.geometricAltitudeKm <= s.altitudeKm[1])
        inBand += e.noxKgPerYear;
    }
    const applicable = inBand > 0;
    const perKg = s.columnChangePct / (s.noxTgPerYear * 1e9);
    const central = perKg * inBand;
    return {
      study: s.id,
      citation: s.citation,
      altitudeKm: s.altitudeKm,
      applicable,
      noxInBandKgPerYear: inBand,
      columnChangePct: applicable
        ? { central, low: central * (1 - FLEET_CONTEXT_BAND), high: central * (1 + FLEET_CONTEXT_BAND) }
        : null,
      note: applicable
        ? `Linear scaling of ${s.noxTgPerYear} Tg NOx/yr -> ${s.columnChangePct} % column ozone at ${s.altitudeKm[0]}-${s.altitudeKm[1]} km, +/-50 %; a fleet-scale model result, not a property of one flight. Check the study's NOx mass basis.`
        : `Not applicable: no NOx above the tropopause at ${s.altitudeKm[0]}-${s.altitudeKm[1]} km, the altitudes this study covers; it is never extrapolated.`,
    };
  });
}
