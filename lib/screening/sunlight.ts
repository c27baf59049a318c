/**
 * Sunlight for the photolysis rates and the share of the emission that is active as NOx.
 *
 * Solar geometry: declination by Cooper (1969, Solar Energy 12, 333: delta = 23.45 deg
 * sin(2 pi (284 + n) / 365)), the sunset hour angle h0 = arccos(-tan(lat) tan(delta)) and the
 * daily-mean cosine of the solar zenith angle (h0 sin(lat) sin(delta) + cos(lat) cos(delta) sin(h0)) / pi
 * (e.g. Hartmann, Global Physical Climatology, ch. 2), zero in polar night.
 *
 * Residence: the emission leaves the stratosphere by first-order removal, so the share still there
 * after t is exp(-t/tau) with tau the mean residence (e-folding) time; the integrated burden is
 * N tau and each day is weighted by exp(-t/tau)/tau. Early days count most: NOx emitted into the
 * polar night is mostly gone before the sun that returns months later reaches it.
 *
 * Dark conversion: in continuous darkness the emitted NOx turns into N2O5 (NO2 + O3 -> NO3,
 * NO3 + NO2 + M -> N2O5) and, on the background sulfate aerosol, into HNO3 (N2O5 + H2O -> 2 HNO3),
 * within days; HNO3 gives NOx back only in sunlight (photolysis and OH + HNO3), over weeks. The
 * active share a(t) (1 = the sunlit steady state that f_NOx/NOy describes) follows
 * da/dt = (1 - a) pi mu / DAY_REACTIVATION_DAYS - a max(0, 1 - D/DARK_CONVERSION_DAY_FRACTION) / DARK_CONVERSION_DAYS,
 * mu the daily-mean cos zenith and D the sunlit fraction of the day, starting from a(0) = 1. Nights of up to 18 h are part of the
 * diurnal steady state and convert nothing extra; a polar night converts it all within days.
 *
 * Numerics: per whole degree of latitude, the periodic steady state of a(t) times D(t) and cos
 * zenith is held as a Fourier series over the year (exact exponential weighting for any tau), and
 * the start-dependent transient (a(0) = 1 against the periodic state) in a table over start day and
 * a logarithmic tau grid, both built once per latitude row on first use.
 */

const DEG = Math.PI / 180;
const DAYS = 365;
const LAT_ROWS = 181;
const OMEGA = (2 * Math.PI) / DAYS;
/** Harmonics of the annual Fourier series. */
const HARMONICS = 12;

/**
 * E-folding time (days) of NOx -> N2O5 -> HNO3 in continuous darkness. From the JPL 19-5 rate of
 * NO2 + O3 -> NO3 + O2 (1.2e-13 exp(-2450/T), table 1) at 215 K and 0.3-0.4 ppmv O3 near 11-12 km
 * (NOx lifetime about 2 days, two NO2 per N2O5) and N2O5 hydrolysis on sulfate aerosol with uptake
 * coefficient 0.1 (JPL 19-5 table 5) on a background surface area of 0.5-1 um^2 cm^-3 (from memory;
 * about 2-4 days): about 5 days (range 2-10).
 */
export const DARK_CONVERSION_DAYS = 5;
/** Sunlit fraction of the day below which the night converts NOx beyond the diurnal steady state (nights over 18 h). */
export const DARK_CONVERSION_DAY_FRACTION = 0.25;
/**
 * E-folding time (days) for HNO3 to give NOx back by photolysis and OH + HNO3 in the lower
 * stratosphere under an equinoctial equatorial sun (daily-mean cos zenith 1/pi), scaled by the
 * daily-mean cos zenith (both J(HNO3) and OH follow the sunlight): one to two months there, longer
 * lower down and under a low sun (Brasseur & Solomon 2005, Aeronomy of the Middle Atmosphere, ch. 5,
 * photochemical lifetimes of the NOy species; from memory). 60 days.
 */
export const DAY_REACTIVATION_DAYS = 60;

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

// Logarithmic grid of e-folding times (years) for the transient table.
const TAU_GRID_MIN = 0.01;
const TAU_GRID_MAX = 20;
const TAU_GRID_N = 28;
const LN_TAU_MIN = Math.log(TAU_GRID_MIN);
const LN_TAU_STEP = (Math.log(TAU_GRID_MAX) - LN_TAU_MIN) / (TAU_GRID_N - 1);

/** One latitude row: Fourier coefficients (re, im per harmonic 0..HARMONICS) and the transient table. */
interface Row {
  /** a_p(t) D(t), a_p(t) cos(t), D(t): three series of 2 (HARMONICS + 1) numbers. */
  series: Float64Array;
  /** Transient corrections [startDay][tau][aD, aC], or null when no night converts anything. */
  transient: Float64Array | null;
  /** Mean of the transient over start days [tau][aD, aC], or null. */
  meanTransient: Float64Array | null;
}

const SERIES_LEN = 2 * (HARMONICS + 1);

// Position of `tauYears` on the logarithmic grid: lower index and weight of the next node.
const GRID_POS: [number, number] = [0, 0];
function tauGridPosition(tauYears: number): [number, number] {
  let g = (Math.log(Math.max(TAU_GRID_MIN, Math.min(TAU_GRID_MAX, tauYears))) - LN_TAU_MIN) / LN_TAU_STEP;
  if (g > TAU_GRID_N - 1) g = TAU_GRID_N - 1;
  const j0 = Math.min(TAU_GRID_N - 2, Math.floor(g));
  GRID_POS[0] = j0;
  GRID_POS[1] = g - j0;
  return GRID_POS;
}
const rows: (Row | null)[] = new Array<Row | null>(LAT_ROWS).fill(null);

function darkRate(d: number): number {
  const x = 1 - d / DARK_CONVERSION_DAY_FRACTION;
  return x > 0 ? x / DARK_CONVERSION_DAYS : 0;
}

function lightRate(meanCos: number): number {
  return (meanCos * Math.PI) / DAY_REACTIVATION_DAYS;
}

// Mean over one day of the relaxation factor (1 - exp(-lambda)) / lambda.
function dayMeanFactor(lambda: number): number {
  return lambda > 1e-9 ? (1 - Math.exp(-lambda)) / lambda : 1 - lambda / 2;
}

function buildRow(r: number): Row {
  const lat = r - 90;
  const dF = new Float64Array(DAYS);
  const cF = new Float64Array(DAYS);
  const lam = new Float64Array(DAYS);
  const aStar = new Float64Array(DAYS);
  let converts = false;
  for (let k = 0; k < DAYS; k++) {
    const s = daySunlight(lat, k + 1);
    dF[k] = s.dayFraction;
    cF[k] = s.meanCosZenith;
    const p = lightRate(s.meanCosZenith);
    const q = darkRate(s.dayFraction);
    if (q > 0) converts = true;
    lam[k] = p + q;
    aStar[k] = p + q > 0 ? p / (p + q) : 1;
  }
  // Periodic state of the active share at the start of each day, and its mean over each day.
  const aStart = new Float64Array(DAYS + 1);
  const aMean = new Float64Array(DAYS);
  if (converts) {
    let a = 1;
    for (let cycle = 0; cycle < 4; cycle++) {
      for (let k = 0; k < DAYS; k++) {
        if (cycle === 3) aStart[k] = a;
        a = aStar[k] + (a - aStar[k]) * Math.exp(-lam[k]);
      }
    }
    aStart[DAYS] = a;
    for (let k = 0; k < DAYS; k++) aMean[k] = aStar[k] + (aStart[k] - aStar[k]) * dayMeanFactor(lam[k]);
  } else {
    aStart.fill(1);
    aMean.fill(1);
  }
  // Fourier coefficients of the daily values placed at mid-day (t = k + 0.5 days from 1 January 0 h).
  const series = new Float64Array(3 * SERIES_LEN);
  for (let j = 0; j <= HARMONICS; j++) {
    let r0 = 0;
    let i0 = 0;
    let r1 = 0;
    let i1 = 0;
    let r2 = 0;
    let i2 = 0;
    for (let k = 0; k < DAYS; k++) {
      const ph = j * OMEGA * (k + 0.5);
      const c = Math.cos(ph);
      const s = -Math.sin(ph);
      const ad = aMean[k] * dF[k];
      const ac = aMean[k] * cF[k];
      r0 += ad * c;
      i0 += ad * s;
      r1 += ac * c;
      i1 += ac * s;
      r2 += dF[k] * c;
      i2 += dF[k] * s;
    }
    series[2 * j] = r0 / DAYS;
    series[2 * j + 1] = i0 / DAYS;
    series[SERIES_LEN + 2 * j] = r1 / DAYS;
    series[SERIES_LEN + 2 * j + 1] = i1 / DAYS;
    series[2 * SERIES_LEN + 2 * j] = r2 / DAYS;
    series[2 * SERIES_LEN + 2 * j + 1] = i2 / DAYS;
  }
  if (!converts) return { series, transient: null, meanTransient: null };
  // Transient: emitted at the start of day k0 with a = 1 while the periodic state has aStart[k0];
  // the difference decays as the periodic state does, delta(k) = delta0 exp(-(E(k) - E(k0))) with
  // E the running sum of lambda. Its weighted sum is a backward recursion per tau over two years
  // unrolled (each start followed for a year, after which the difference has long gone):
  // S(k) = (1 - kappa) dayMean(k) exp(-E(k)) g(k) + kappa S(k + 1), transient(k0) = delta0 exp(E(k0)) S(k0).
  const span = 2 * DAYS;
  const e = new Float64Array(span + 1);
  for (let k = 0; k < span; k++) e[k + 1] = e[k] + lam[k % DAYS];
  const qd = new Float64Array(span);
  const qc = new Float64Array(span);
  for (let k = 0; k < span; k++) {
    const f = dayMeanFactor(lam[k % DAYS]) * Math.exp(-e[k]);
    qd[k] = f * dF[k % DAYS];
    qc[k] = f * cF[k % DAYS];
  }
  const transient = new Float64Array(DAYS * TAU_GRID_N * 2);
  const meanTransient = new Float64Array(TAU_GRID_N * 2);
  for (let j = 0; j < TAU_GRID_N; j++) {
    const kappa = Math.exp(-1 / (Math.exp(LN_TAU_MIN + j * LN_TAU_STEP) * DAYS));
    let sd = 0;
    let sc = 0;
    for (let k = span - 1; k >= 0; k--) {
      sd = (1 - kappa) * qd[k] + kappa * sd;
      sc = (1 - kappa) * qc[k] + kappa * sc;
      if (k < DAYS) {
        const scale = (1 - aStart[k]) * Math.exp(e[k]);
        const o = k * TAU_GRID_N * 2 + 2 * j;
        transient[o] = scale * sd;
        transient[o + 1] = scale * sc;
        meanTransient[2 * j] += transient[o] / DAYS;
        meanTransient[2 * j + 1] += transient[o + 1] / DAYS;
      }
    }
  }
  return { series, transient, meanTransient };
}

function row(r: number): Row {
  let x = rows[r];
  if (x === null) {
    x = buildRow(r);
    rows[r] = x;
  }
  return x;
}

/**
 * Sunlight and the active share of the emission, weighted over its stay above the tropopause.
 * Values are means over the emission's e-folding residence (weights exp(-t/tau)/tau).
 */
export interface WindowSunlight {
  /** Daylight factor D of the loss: the weighted mean of a(t) x sunlit fraction of the day. */
  dayFraction: number;
  /** Weighted mean of a(t) x daily-mean cos zenith. */
  meanCosZenith: number;
  /** Mean cos zenith while the sun is up: meanCosZenith / dayFraction (0 when never up). */
  daytimeCosZenith: number;
  /** Weighted sunlit fraction of the day, from geometry alone (no dark conversion). */
  sunlitFraction: number;
  /** Share of the sunlit time the emission spends active as NOx: dayFraction / sunlitFraction (1 without polar night). */
  activeShare: number;
}

// Exponentially weighted means of the three Fourier series (rows `a` and `b` blended by `wb`) for a
// start at t0 days: A0 + 2 sum Re(A_j e^{i j w t0} / (1 - i j w tau)), written into SUMS.
const SUMS = new Float64Array(3);
function weighted(a: Float64Array, b: Float64Array, wb: number, t0: number, tauDays: number): void {
  const wa = 1 - wb;
  let s0 = wa * a[0] + wb * b[0];
  let s1 = wa * a[SERIES_LEN] + wb * b[SERIES_LEN];
  let s2 = wa * a[2 * SERIES_LEN] + wb * b[2 * SERIES_LEN];
  const c1 = Math.cos(OMEGA * t0);
  const sn1 = Math.sin(OMEGA * t0);
  const step = OMEGA * tauDays;
  let c = c1;
  let s = sn1;
  for (let j = 1; j <= HARMONICS; j++) {
    const bb = j * step;
    const g = 2 / (1 + bb * bb);
    // Re(z (1 + i bb)) with z = A e^{i phase}: (Ar c - Ai s) - bb (Ar s + Ai c).
    const p = c - bb * s;
    const q = s + bb * c;
    const o = 2 * j;
    const o1 = SERIES_LEN + o;
    const o2 = 2 * SERIES_LEN + o;
    s0 += g * ((wa * a[o] + wb * b[o]) * p - (wa * a[o + 1] + wb * b[o + 1]) * q);
    s1 += g * ((wa * a[o1] + wb * b[o1]) * p - (wa * a[o1 + 1] + wb * b[o1 + 1]) * q);
    s2 += g * ((wa * a[o2] + wb * b[o2]) * p - (wa * a[o2 + 1] + wb * b[o2 + 1]) * q);
    const cn = c * c1 - s * sn1;
    s = s * c1 + c * sn1;
    c = cn;
  }
  SUMS[0] = s0;
  SUMS[1] = s1;
  SUMS[2] = s2;
}

// Transient correction (which: 0 the a D sum, 1 the a cos sum) at the tau-grid position (j0, wj),
// for start-day index k0 (+ frac towards the next day) or, with k0 = -1, the mean over start days.
function transientAt(x: Row, k0: number, frac: number, j0: number, wj: number, which: number): number {
  if (k0 < 0) {
    const m = x.meanTransient;
    if (m === null) return 0;
    return (1 - wj) * m[2 * j0 + which] + wj * m[2 * j0 + 2 + which];
  }
  const t = x.transient;
  if (t === null) return 0;
  const o0 = k0 * TAU_GRID_N * 2 + 2 * j0 + which;
  const o1 = ((k0 + 1) % DAYS) * TAU_GRID_N * 2 + 2 * j0 + which;
  const v0 = (1 - wj) * t[o0] + wj * t[o0 + 2];
  const v1 = (1 - wj) * t[o1] + wj * t[o1 + 2];
  return (1 - frac) * v0 + frac * v1;
}

/**
 * Sunlight at `latDeg` for an emission on day of year `startDay` (1-366, fractional allowed; at the
 * start of that day) that stays with e-folding time `years` (> 0): means weighted by
 * exp(-t/tau)/tau, including the dark conversion to HNO3. With `startDay` null the mean over all
 * start days (an emission spread evenly over the year). Linear between whole degrees of latitude.
 */
export function windowSunlight(
  latDeg: number,
  startDay: number | null,
  years: number,
  out?: WindowSunlight,
): WindowSunlight {
  const x = Math.min(90, Math.max(-90, latDeg)) + 90;
  const r0 = Math.min(LAT_ROWS - 2, Math.floor(x));
  const wb = x - r0;
  const a = row(r0);
  const b = row(r0 + 1);
  const tauYears = years > 0 ? years : TAU_GRID_MIN;
  let d: number;
  let c: number;
  let f: number;
  if (startDay === null) {
    d = (1 - wb) * a.series[0] + wb * b.series[0];
    c = (1 - wb) * a.series[SERIES_LEN] + wb * b.series[SERIES_LEN];
    f = (1 - wb) * a.series[2 * SERIES_LEN] + wb * b.series[2 * SERIES_LEN];
    if (a.transient !== null || b.transient !== null) {
      const [j0, wj] = tauGridPosition(tauYears);
      d += (1 - wb) * transientAt(a, -1, 0, j0, wj, 0) + wb * transientAt(b, -1, 0, j0, wj, 0);
      c += (1 - wb) * transientAt(a, -1, 0, j0, wj, 1) + wb * transientAt(b, -1, 0, j0, wj, 1);
    }
  } else {
    const t0 = (((Math.min(366, Math.max(1, startDay)) - 1) % DAYS) + DAYS) % DAYS;
    const tauDays = tauYears * DAYS;
    weighted(a.series, b.series, wb, t0, tauDays);
    d = SUMS[0];
    c = SUMS[1];
    f = SUMS[2];
    const k0 = Math.floor(t0);
    const fr = t0 - k0;
    if (a.transient !== null || b.transient !== null) {
      const [j0, wj] = tauGridPosition(tauYears);
      d += (1 - wb) * transientAt(a, k0, fr, j0, wj, 0) + wb * transientAt(b, k0, fr, j0, wj, 0);
      c += (1 - wb) * transientAt(a, k0, fr, j0, wj, 1) + wb * transientAt(b, k0, fr, j0, wj, 1);
    }
  }
  // The truncated series can ring a little below 0 or above 1 near polar night: hold the physical range.
  f = f < 0 ? 0 : f > 1 ? 1 : f;
  d = d < 0 ? 0 : d > f ? f : d;
  c = c < 0 ? 0 : c;
  const res = out ?? { dayFraction: 0, meanCosZenith: 0, daytimeCosZenith: 0, sunlitFraction: 0, activeShare: 1 };
  res.dayFraction = d;
  res.meanCosZenith = c;
  res.daytimeCosZenith = d > 1e-6 ? Math.min(1, c / d) : 0;
  res.sunlitFraction = f;
  res.activeShare = f > 1e-6 ? d / f : 1;
  return res;
}
