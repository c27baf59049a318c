/**
 * Sunlight for the photolysis rates: solar declination (Cooper 1969, Solar Energy 12, 333:
 * delta = 23.45 deg sin(2 pi (284 + n) / 365)), the sunset hour angle h0 = arccos(-tan(lat) tan(delta))
 * and the daily-mean cosine of the solar zenith angle (h0 sin(lat) sin(delta) + cos(lat) cos(delta)
 * sin(h0)) / pi (e.g. Hartmann, Global Physical Climatology, ch. 2), zero in polar night. Averages
 * over a window of days are read from per-degree-of-latitude cumulative sums built once.
 */

const DEG = Math.PI / 180;
const DAYS = 365;
const LAT_ROWS = 181;

/** Solar declination, radians, on day of year `n` (Cooper 1969). */
export function solarDeclinationRad(dayOfYear: number): number {
  return 23.45 * DEG * Math.sin((2 * Math.PI * (284 + dayOfYear)) / 365);
}

/** Daylight of one day: the sunlit fraction of 24 h and the daily-mean cos of the zenith angle. */
export interface DaySunlight {
  /** Sunlit fraction of the day, 0..1 (day length / 24 h). */
  dayFraction: number;
  /** Daily mean of max(cos zenith, 0) over 24 h. */
  meanCosZenith: number;
}

/** Day length and daily-mean cos zenith at `latDeg` on day of year `dayOfYear`. */
export function daySunlight(latDeg: number, dayOfYear: number): DaySunlight {
  const phi = latDeg * DEG;
  const d = solarDeclinationRad(dayOfYear);
  const x = -Math.tan(phi) * Math.tan(d);
  const h0 = x >= 1 ? 0 : x <= -1 ? Math.PI : Math.acos(x);
  const mean = (h0 * Math.sin(phi) * Math.sin(d) + Math.cos(phi) * Math.cos(d) * Math.sin(h0)) / Math.PI;
  return { dayFraction: h0 / Math.PI, meanCosZenith: mean > 0 ? mean : 0 };
}

// Cumulative sums per whole degree of latitude (-90..90) over days 1..365: index lat*(DAYS+1)+k holds
// the sum over the first k days.
let cumCos: Float64Array | null = null;
let cumDay: Float64Array | null = null;

function tables(): [Float64Array, Float64Array] {
  if (cumCos === null || cumDay === null) {
    const c = new Float64Array(LAT_ROWS * (DAYS + 1));
    const f = new Float64Array(LAT_ROWS * (DAYS + 1));
    for (let r = 0; r < LAT_ROWS; r++) {
      const o = r * (DAYS + 1);
      for (let k = 0; k < DAYS; k++) {
        const s = daySunlight(r - 90, k + 1);
        c[o + k + 1] = c[o + k] + s.meanCosZenith;
        f[o + k + 1] = f[o + k] + s.dayFraction;
      }
    }
    cumCos = c;
    cumDay = f;
  }
  return [cumCos, cumDay];
}

// Sum over days [0, x) of one latitude row, x in days from day 1 (fractional, any size).
function cumulative(t: Float64Array, o: number, x: number): number {
  const years = Math.floor(x / DAYS);
  const r = x - years * DAYS;
  const k = Math.floor(r);
  const within = t[o + k] + (k < DAYS ? (r - k) * (t[o + k + 1] - t[o + k]) : 0);
  return years * t[o + DAYS] + within;
}

/** Sunlight averaged over a window, with the derived values the assumptions show. */
export interface WindowSunlight {
  /** Mean sunlit fraction over the window (the daylight factor D). */
  dayFraction: number;
  /** Mean of the daily-mean cos zenith over the window. */
  meanCosZenith: number;
  /** Mean cos zenith while the sun is up: meanCosZenith / dayFraction (0 when never up). */
  daytimeCosZenith: number;
}

/**
 * Sunlight at `latDeg` averaged over `years` (> 0) starting on day of year `startDay` (1-366), or the
 * annual mean when `startDay` is null. Linear between whole degrees of latitude.
 */
export function windowSunlight(
  latDeg: number,
  startDay: number | null,
  years: number,
  out?: WindowSunlight,
): WindowSunlight {
  const [tc, tf] = tables();
  const x = Math.min(90, Math.max(-90, latDeg)) + 90;
  const r0 = Math.min(LAT_ROWS - 2, Math.floor(x));
  const w = x - r0;
  let c: number;
  let f: number;
  if (startDay === null) {
    const o0 = r0 * (DAYS + 1);
    const o1 = o0 + DAYS + 1;
    c = ((1 - w) * tc[o0 + DAYS] + w * tc[o1 + DAYS]) / DAYS;
    f = ((1 - w) * tf[o0 + DAYS] + w * tf[o1 + DAYS]) / DAYS;
  } else {
    const len = Math.max(1, years * DAYS);
    const a = (Math.min(DAYS, Math.max(1, startDay)) - 1) % DAYS;
    const b = a + len;
    const o0 = r0 * (DAYS + 1);
    const o1 = o0 + DAYS + 1;
    const c0 = cumulative(tc, o0, b) - cumulative(tc, o0, a);
    const c1 = cumulative(tc, o1, b) - cumulative(tc, o1, a);
    const f0 = cumulative(tf, o0, b) - cumulative(tf, o0, a);
    const f1 = cumulative(tf, o1, b) - cumulative(tf, o1, a);
    c = ((1 - w) * c0 + w * c1) / len;
    f = ((1 - w) * f0 + w * f1) / len;
  }
  const res = out ?? { dayFraction: 0, meanCosZenith: 0, daytimeCosZenith: 0 };
  res.dayFraction = f;
  res.meanCosZenith = c;
  res.daytimeCosZenith = f > 1e-9 ? c / f : 0;
  return res;
}
