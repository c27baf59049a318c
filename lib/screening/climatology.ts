/**
 * The climatological tropopause and the climatological column it is placed in.
 *
 * Height: the lookup-table model (BTH) of Mateus, Mendes & Pires (2022), Remote Sensing 14, 4303
 * (doi:10.3390/rs14174303), its 3.5 PVU table of tropopause heights (km, geometric) for 23 latitude
 * bands and 12 mid-month days, as published with the paper and in the authors' released code
 * (`bth_model.py` of pjmateus/global_tropopause_model, array `Tpvu35`). The interpolation here is
 * this engine's own: bilinear in latitude and day of year, held at the 85 degree bands poleward,
 * cyclic across the year end (day 350 -> day 16 + 365). The annual mean is the mean of the 12 rows.
 *
 * Column: pressure and temperature with geometric height of the AFGL 1986 model atmospheres
 * (Anderson et al. 1986, AFGL-TR-86-0110, tables 1a-1e, the same atmospheres as the ozone
 * profiles), ln p and T linear in height between the tabulated levels.
 */
import { BOLTZMANN_J_K, geopotentialFromGeometricM, isaPressureAltitudeAt } from './atmosphere';
import type { OzoneProfileName } from '../validation/screening';

/** Source line of the tropopause height model. */
export const BTH_SOURCE =
  'Mateus, Mendes & Pires (2022), Remote Sensing 14, 4303, lookup-table model (BTH), 3.5 PVU table (23 latitude bands x 12 mid-month days, RMSE about 0.7 km), bilinear interpolation';

/** Source line of the climatological p/T column. */
export const AFGL_COLUMN_SOURCE =
  'AFGL 1986 model atmospheres (Anderson et al. 1986, AFGL-TR-86-0110, tables 1a-1e), pressure and temperature by geometric height, ln p and T linear between levels';

/**
 * The BTH 3.5 PVU table (the published array transposed) a row per latitude band: the band centre
 * (degrees), then the tropopause height (km, geometric) on each of the 12 mid-month days (BTH_DAYS),
 * January first.
 */
const BTH_BY_BAND: readonly (readonly number[])[] = [
  [-85, 8.295, 8.06, 8.017, 8.295, 8.764, 9.245, 9.565, 9.857, 9.831, 9.591, 9.173, 8.532],
  [-75, 8.522, 8.333, 8.195, 8.326, 8.759, 9.268, 9.612, 9.793, 9.774, 9.452, 9.107, 8.713],
  [-65, 8.689, 8.562, 8.501, 8.608, 8.94, 9.333, 9.618, 9.736, 9.675, 9.268, 8.981, 8.787],
  [-55, 9.281, 9.37, 9.468, 9.529, 9.606, 9.751, 9.834, 9.889, 9.778, 9.603, 9.476, 9.38],
  [-45, 11.333, 11.485, 11.402, 11.162, 10.811, 10.538, 10.422, 10.366, 10.372, 10.573, 10.802, 11.05],
  [-37.5, 12.995, 13.103, 12.68, 12.142, 11.628, 11.213, 10.98, 10.876, 11.037, 11.38, 11.821, 12.395],
  [-32.5, 14.791, 14.961, 14.54, 13.502, 12.6, 12.268, 12.388, 12.42, 12.529, 12.721, 13.193, 14.097],
  [-27.5, 15.916, 16.034, 15.92, 15.542, 15.191, 15.141, 15.357, 15.402, 15.268, 15.248, 15.327, 15.674],
  [-22.5, 16.275, 16.334, 16.285, 16.199, 16.147, 16.08, 16.019, 16.011, 15.95, 16.056, 16.118, 16.186],
  [-17.5, 16.368, 16.393, 16.381, 16.363, 16.299, 16.211, 16.142, 16.144, 16.13, 16.203, 16.271, 16.322],
  [-10, 16.409, 16.413, 16.414, 16.419, 16.408, 16.281, 16.184, 16.19, 16.198, 16.26, 16.368, 16.397],
  [0, 16.418, 16.425, 16.434, 16.45, 16.462, 16.288, 16.142, 16.137, 16.178, 16.257, 16.401, 16.418],
  [10, 16.406, 16.417, 16.42, 16.413, 16.395, 16.262, 16.037, 16.068, 16.136, 16.248, 16.359, 16.388],
  [17.5, 16.38, 16.395, 16.368, 16.342, 16.301, 16.156, 15.923, 15.962, 16.087, 16.207, 16.277, 16.342],
  [22.5, 16.334, 16.338, 16.308, 16.249, 16.13, 16.014, 15.884, 15.908, 16.031, 16.129, 16.178, 16.262],
  [27.5, 15.796, 15.833, 15.829, 15.455, 15.302, 15.716, 15.745, 15.764, 15.832, 15.805, 15.796, 15.838],
  [32.5, 13.238, 12.998, 12.69, 12.879, 13.856, 15.003, 15.395, 15.377, 15.268, 14.938, 14.415, 13.897],
  [37.5, 10.937, 10.867, 11.19, 11.739, 12.357, 13.566, 14.564, 14.571, 14.203, 13.207, 12.287, 11.557],
  [45, 10.099, 10.063, 10.31, 10.686, 11.102, 11.535, 12.236, 12.349, 11.956, 11.435, 10.87, 10.361],
  [55, 9.457, 9.415, 9.489, 9.719, 10.035, 10.378, 10.684, 10.688, 10.349, 9.992, 9.679, 9.526],
  [65, 9.085, 9.002, 8.932, 9.023, 9.282, 9.771, 10.164, 10.025, 9.642, 9.294, 9.078, 9.066],
  [75, 8.879, 8.738, 8.545, 8.465, 8.657, 9.125, 9.515, 9.485, 9.22, 8.887, 8.8, 8.821],
  [85, 8.767, 8.555, 8.347, 8.265, 8.355, 8.612, 9.03, 9.036, 8.772, 8.536, 8.56, 8.754],
];

/** Latitude band centres of the BTH table, degrees. */
export const BTH_BANDS_DEG: readonly number[] = Object.freeze(BTH_BY_BAND.map((row) => row[0]));

/** Mid-month days of year of the BTH table: 12 days evenly from 16 to 350. */
export const BTH_DAYS: readonly number[] = Object.freeze(
  Array.from({ length: 12 }, (_, i) => 16 + (i * (350 - 16)) / 11),
);

/** BTH 3.5 PVU tropopause height, km (geometric); row = day (BTH_DAYS), column = band (BTH_BANDS_DEG). */
export const BTH_35PVU_KM: readonly (readonly number[])[] = Object.freeze(
  BTH_DAYS.map((_, day) => BTH_BY_BAND.map((row) => row[1 + day])),
);

const NB = BTH_BANDS_DEG.length;
const BTH_ANNUAL_KM: Float64Array = (() => {
  const out = new Float64Array(NB);
  for (let b = 0; b < NB; b++) {
    let s = 0;
    for (const row of BTH_35PVU_KM) s += row[b];
    out[b] = s / BTH_35PVU_KM.length;
  }
  return out;
})();

/**
 * The BTH heights of every band for one day of year (time-interpolated, cyclic), or the annual
 * mean for `null`, km. The engine interpolates this row in latitude for each segment.
 */
export function bthRowForDay(dayOfYear: number | null): Float64Array {
  if (dayOfYear === null) return BTH_ANNUAL_KM;
  const hit = ROW_CACHE.get(dayOfYear);
  if (hit !== undefined) return hit;
  const row = interpolateRow(dayOfYear);
  // Flight dates give whole days and months half days: a few hundred keys at most.
  if (ROW_CACHE.size < 1000) ROW_CACHE.set(dayOfYear, row);
  return row;
}

const ROW_CACHE = new Map<number, Float64Array>();

function interpolateRow(dayOfYear: number): Float64Array {
  const first = BTH_DAYS[0];
  const last = BTH_DAYS[BTH_DAYS.length - 1];
  let d = dayOfYear;
  if (d < first) d += 365;
  let i0: number;
  let i1: number;
  let f: number;
  if (d >= last) {
    i0 = BTH_DAYS.length - 1;
    i1 = 0;
    f = (d - last) / (first + 365 - last);
  } else {
    i0 = 0;
    while (d >= BTH_DAYS[i0 + 1]) i0++;
    i1 = i0 + 1;
    f = (d - BTH_DAYS[i0]) / (BTH_DAYS[i1] - BTH_DAYS[i0]);
  }
  const a = BTH_35PVU_KM[i0];
  const b = BTH_35PVU_KM[i1];
  const out = new Float64Array(NB);
  for (let k = 0; k < NB; k++) out[k] = a[k] + f * (b[k] - a[k]);
  return out;
}

// Band index by whole degree from -85: the first band at or below that degree (bands fall on
// whole or half degrees, so one step forward at most is left to check).
const BAND_BY_DEGREE: Int8Array = (() => {
  const out = new Int8Array(171);
  let i = 0;
  for (let d = 0; d <= 170; d++) {
    while (i < NB - 2 && BTH_BANDS_DEG[i + 1] <= d - 85) i++;
    out[d] = i;
  }
  return out;
})();

/** Tropopause height (km, geometric) at `latDeg` on a row from `bthRowForDay`; held beyond +/-85. */
export function bthHeightKm(row: Float64Array, latDeg: number): number {
  if (latDeg <= BTH_BANDS_DEG[0]) return row[0];
  if (latDeg >= BTH_BANDS_DEG[NB - 1]) return row[NB - 1];
  let i = BAND_BY_DEGREE[Math.floor(latDeg + 85)];
  while (i < NB - 2 && latDeg > BTH_BANDS_DEG[i + 1]) i++;
  const f = (latDeg - BTH_BANDS_DEG[i]) / (BTH_BANDS_DEG[i + 1] - BTH_BANDS_DEG[i]);
  return row[i] + f * (row[i + 1] - row[i]);
}

// Anderson et al. (1986), AFGL-TR-86-0110, tables 1a-1e, p (mb = hPa) and T (K) by geometric height.
// Checked value by value against the machine-readable transcription of the open-source joseki
// library (its subarctic-winter surface pressure reads 101.3 there, a slip for the report's 1013).
/** The AFGL order of the atmospheres in the rows of AFGL_TABLE. */
const AFGL_ORDER: readonly OzoneProfileName[] = [
  'tropical',
  'midlatitude-summer',
  'midlatitude-winter',
  'subarctic-summer',
  'subarctic-winter',
];

/** One row a height: km, then p (hPa) and T (K) of each atmosphere in AFGL_ORDER. */
const AFGL_TABLE: readonly (readonly number[])[] = [
  // km, tropical p T, mid-latitude summer p T, mid-latitude winter p T, subarctic summer p T, subarctic winter p T
  [0, 1013.0, 299.7, 1013.0, 294.2, 1018.0, 272.2, 1010.0, 287.2, 1013.0, 257.2],
  [1, 904.0, 293.7, 902.0, 289.7, 897.3, 268.7, 896.0, 281.7, 887.8, 259.1],
  [2, 805.0, 287.7, 802.0, 285.2, 789.7, 265.2, 792.9, 276.3, 777.5, 255.9],
  [3, 715.0, 283.7, 710.0, 279.2, 693.8, 261.7, 700.0, 270.9, 679.8, 252.7],
  [4, 633.0, 277.0, 628.0, 273.2, 608.1, 255.7, 616.0, 265.5, 593.2, 247.7],
  [5, 559.0, 270.3, 554.0, 267.2, 531.3, 249.7, 541.0, 260.1, 515.8, 240.9],
  [6, 492.0, 263.6, 487.0, 261.2, 462.7, 243.7, 474.0, 253.1, 446.7, 234.1],
  [7, 432.0, 257.0, 426.0, 254.7, 401.6, 237.7, 413.0, 246.1, 385.3, 227.3],
  [8, 378.0, 250.3, 372.0, 248.2, 347.3, 231.7, 359.0, 239.2, 330.8, 220.9],
  [9, 329.0, 243.6, 324.0, 241.7, 299.3, 225.7, 310.8, 232.2, 282.9, 217.2],
  [10, 286.0, 237.0, 281.0, 235.3, 256.8, 219.7, 267.7, 225.2, 241.8, 217.2],
  [11, 247.0, 230.1, 243.0, 228.8, 219.9, 219.2, 230.0, 225.2, 206.7, 217.2],
  [12, 213.0, 223.6, 209.0, 222.3, 188.2, 218.7, 197.7, 225.2, 176.6, 217.2],
  [13, 182.0, 217.0, 179.0, 215.8, 161.1, 218.2, 170.0, 225.2, 151.0, 217.2],
  [14, 156.0, 210.3, 153.0, 215.7, 137.8, 217.7, 146.0, 225.2, 129.1, 217.2],
  [15, 132.0, 203.7, 130.0, 215.7, 117.8, 217.2, 126.0, 225.2, 110.3, 217.2],
  [16, 111.0, 197.0, 111.0, 215.7, 100.7, 216.7, 108.0, 225.2, 94.31, 216.6],
  [17, 93.7, 194.8, 95.0, 215.7, 86.1, 216.2, 92.8, 225.2, 80.58, 216.0],
  [18, 78.9, 198.8, 81.2, 216.8, 73.6, 215.7, 79.8, 225.2, 68.82, 215.4],
  [19, 66.6, 202.7, 69.5, 217.9, 62.8, 215.2, 68.6, 225.2, 58.75, 214.8],
  [20, 56.5, 206.7, 59.5, 219.2, 53.7, 215.2, 59.0, 225.2, 50.14, 214.2],
  [21, 48.0, 210.7, 51.0, 220.4, 45.8, 215.2, 50.7, 225.2, 42.77, 213.6],
  [22, 40.9, 214.6, 43.7, 221.6, 39.1, 215.2, 43.6, 225.2, 36.47, 213.0],
  [23, 35.0, 217.0, 37.6, 222.8, 33.4, 215.2, 37.5, 225.2, 31.09, 212.4],
  [24, 30.0, 219.2, 32.2, 223.9, 28.6, 215.2, 32.28, 226.6, 26.49, 211.8],
  [25, 25.7, 221.4, 27.7, 225.1, 24.4, 215.2, 27.8, 228.1, 22.56, 211.2],
  [27.5, 17.63, 227.0, 19.1, 228.5, 16.46, 215.5, 19.23, 231.1, 15.13, 213.6],
  [30, 12.2, 232.3, 13.2, 233.7, 11.1, 217.4, 13.4, 235.1, 10.2, 216.0],
  [32.5, 8.52, 237.7, 9.3, 239.0, 7.56, 220.4, 9.4, 240.0, 6.91, 218.5],
  [35, 6.0, 243.1, 6.52, 245.2, 5.18, 227.9, 6.61, 247.2, 4.701, 222.3],
];

/** Geometric heights (km) of the embedded AFGL p/T grid (the ozone grid): 0-25 km by 1 km, 27.5-35 km. */
export const AFGL_COLUMN_KM: readonly number[] = Object.freeze(AFGL_TABLE.map((row) => row[0]));

/** Pressure (hPa) and temperature (K) of one AFGL atmosphere on AFGL_COLUMN_KM. */
type AfglAtmosphere = { pressureHpa: readonly number[]; temperatureK: readonly number[] };

/** Pressure (hPa) and temperature (K) of each AFGL atmosphere on AFGL_COLUMN_KM. */
export const AFGL_PT: Readonly<Record<OzoneProfileName, AfglAtmosphere>> = Object.freeze(
  Object.fromEntries(
    AFGL_ORDER.map((name, i): [OzoneProfileName, AfglAtmosphere] => [
      name,
      { pressureHpa: AFGL_TABLE.map((row) => row[1 + 2 * i]), temperatureK: AFGL_TABLE.map((row) => row[2 + 2 * i]) },
    ]),
  ) as Record<OzoneProfileName, AfglAtmosphere>,
);

/** A climatological column: ln p (Pa) and T (K) on AFGL_COLUMN_KM. */
export interface Column {
  lnPressurePa: Float64Array;
  temperatureK: Float64Array;
}

function columnOf(name: OzoneProfileName): Column {
  const t = AFGL_PT[name];
  return {
    lnPressurePa: Float64Array.from(t.pressureHpa, (p) => Math.log(p * 100)),
    temperatureK: Float64Array.from(t.temperatureK),
  };
}

function meanColumn(a: Column, b: Column): Column {
  const n = AFGL_COLUMN_KM.length;
  const out: Column = { lnPressurePa: new Float64Array(n), temperatureK: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    out.lnPressurePa[i] = 0.5 * (a.lnPressurePa[i] + b.lnPressurePa[i]);
    out.temperatureK[i] = 0.5 * (a.temperatureK[i] + b.temperatureK[i]);
  }
  return out;
}

/**
 * Columns by profile slot (the ozone-profile slots of `ozone-loss.ts`): the five AFGL atmospheres,
 * then the mid-latitude and subarctic annual means (mean of summer and winter in ln p and T).
 */
export const COLUMNS: readonly Column[] = (() => {
  const five = AFGL_ORDER.map(columnOf);
  return Object.freeze([...five, meanColumn(five[1], five[2]), meanColumn(five[3], five[4])]);
})();

/** Index of the column layer holding `zKm` (grid: 1 km to 25 km, then 2.5 km to 35 km), ends extended. */
function layerAt(zKm: number): number {
  if (!(zKm > 0)) return 0;
  if (zKm < 25) return Math.floor(zKm);
  const i = 25 + Math.floor((zKm - 25) / 2.5);
  return i > AFGL_COLUMN_KM.length - 2 ? AFGL_COLUMN_KM.length - 2 : i;
}

/** Pressure (Pa) at geometric height `zKm` in a column; the end layers extended. */
export function columnPressurePa(c: Column, zKm: number): number {
  const zs = AFGL_COLUMN_KM;
  const i = layerAt(zKm);
  const f = (zKm - zs[i]) / (zs[i + 1] - zs[i]);
  return Math.exp(c.lnPressurePa[i] + f * (c.lnPressurePa[i + 1] - c.lnPressurePa[i]));
}

/** A point of a column found by pressure. */
export interface ColumnPoint {
  /** Geometric height, km. */
  heightKm: number;
  temperatureK: number;
  /** Air number density p / (kB T), molecule cm^-3. */
  airDensityCm3: number;
}

/** Height, temperature and air density at pressure `pressurePa` in a column; the end layers extended. */
export function columnAtPressure(c: Column, pressurePa: number): ColumnPoint {
  const lp = Math.log(pressurePa);
  const ls = c.lnPressurePa;
  const n = ls.length;
  let i = 0;
  if (lp <= ls[n - 1]) i = n - 2;
  else while (i < n - 2 && lp < ls[i + 1]) i++;
  const f = (ls[i] - lp) / (ls[i] - ls[i + 1]);
  const zs = AFGL_COLUMN_KM;
  const t = c.temperatureK[i] + f * (c.temperatureK[i + 1] - c.temperatureK[i]);
  return {
    heightKm: zs[i] + f * (zs[i + 1] - zs[i]),
    temperatureK: t,
    airDensityCm3: (pressurePa / (BOLTZMANN_J_K * t)) * 1e-6,
  };
}

/** The climatological tropopause placed in its column. */
export interface ClimatologicalTropopause {
  /** Height above mean sea level as the model gives it, geometric m. */
  geometricHeightM: number;
  /** Pressure at that height in the climatological column, hPa. */
  pressureHpa: number;
  /** ISA pressure altitude of that pressure, geopotential m: comparable with a flight level's altitude. */
  pressureAltitudeM: number;
}

/** Places a geometric tropopause height (km) in a column: pressure and its ISA pressure altitude. */
export function placeInColumn(c: Column, heightKm: number): ClimatologicalTropopause {
  const p = columnPressurePa(c, heightKm);
  return { geometricHeightM: heightKm * 1000, pressureHpa: p / 100, pressureAltitudeM: isaPressureAltitudeAt(p) };
}

/** Geopotential altitude (m) of a BTH geometric height (km). */
export function bthGeopotentialM(heightKm: number): number {
  return geopotentialFromGeometricM(heightKm * 1000);
}
