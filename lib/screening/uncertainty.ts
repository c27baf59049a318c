/**
 * Percentiles of a flight's headline figures from Monte Carlo sampling of its really uncertain
 * inputs, and the share of each figure's spread each input explains. Works on a finished screening:
 * the per-segment NOx, levels, tropopause and chemistry state are taken once, and each sample only
 * rescales NOx, shifts the tropopause and re-evaluates the loss formula (no geometry, airports,
 * validation or ISA per sample). Masses in kg (NOx as NO2, O3), heights in m.
 */
import { geometricFromGeopotentialM, isaPressureAltitudeAt } from './atmosphere';
import { COLUMNS, columnAtPressure, columnPressurePa } from './climatology';
import {
  CUSTOM_PROFILE_SLOT,
  COEFFICIENT_COUNT,
  SECONDS_PER_YEAR,
  chemistryAt,
  noxMolecules,
  ozoneKg,
  ozoneLossCoefficients,
  ozonePpmv,
  profileSlotFor,
  resolveOzoneInputs,
  residenceTimeYears,
  type OzoneInputs,
} from './ozone-loss';
import { mulberry32, percentileSorted, standardNormal, subSeed, triangular, type Uniform } from './prng';
import type { ScreeningLevel, ScreeningResult } from './screen-flight';
import { windowSunlight, type WindowSunlight } from './sunlight';
import { OZONE_PROFILE_NAMES, SCREENING_LIMITS, type ScreeningInput } from '../validation/screening';

/** Default number of samples. */
export const DEFAULT_UNCERTAINTY_SAMPLES = 400;
/** Seed used when none is given, so an unseeded request is reproducible too. */
export const DEFAULT_UNCERTAINTY_SEED = 1;

/** The 5th, 50th and 95th percentiles of a figure over the samples. */
export interface Percentiles {
  p5: number;
  p50: number;
  p95: number;
}

/** The inputs that are sampled. */
export const UNCERTAIN_INPUTS = ['cruise-ei', 'tropopause', 'residence-time', 'sunlight', 'nox-noy'] as const;
/** One sampled input. */
export type UncertainInput = (typeof UNCERTAIN_INPUTS)[number];

/** The inputs the all-corners screening band itself spans (J values, NOx/NOy, residence factor, a given daylight factor). */
export const BAND_INPUTS: readonly UncertainInput[] = Object.freeze(['residence-time', 'sunlight', 'nox-noy']);

/** How one input is sampled, with its source. */
export interface SampledDistribution {
  input: UncertainInput;
  label: string;
  distribution: string;
  source: string;
}

/** Share (0..1) of a figure's spread one input explains. */
export interface Driver {
  input: UncertainInput;
  label: string;
  share: number;
}

/** Drivers of each headline figure, largest share first. */
export interface UncertaintyDrivers {
  method: string;
  noxAboveTropopauseKg: Driver[];
  fractionAboveTropopause: Driver[];
  ozoneLossKg: Driver[];
}

/** The sampling result attached to a screening as `uncertainty`. */
export interface ScreeningUncertainty {
  samples: number;
  seed: number;
  noxAboveTropopauseKg: Percentiles;
  fractionAboveTropopause: Percentiles;
  ozoneLossKg: Percentiles;
  /** Ozone percentiles that fall outside the all-corners screening range [lowKg, highKg]. */
  outsideScreeningRange: ('p5' | 'p50' | 'p95')[];
  sampled: SampledDistribution[];
  drivers: UncertaintyDrivers;
  note: string;
}

/** Options of `sampleUncertainty`. */
export interface SampleOptions {
  samples?: number;
  seed?: number;
  /** Sample only these inputs (the others stay central); all by default. */
  only?: readonly UncertainInput[];
  /** Skip the driver analysis (the one-at-a-time runs). */
  drivers?: boolean;
}

const LABELS: Record<UncertainInput, string> = {
  'cruise-ei': 'Cruise EI NOx',
  tropopause: 'Tropopause height',
  'residence-time': 'Residence time',
  sunlight: 'Sunlight (J values, daylight)',
  'nox-noy': 'NOx/NOy share',
};

/**
 * Spread of the tropopause height, 1 sigma, m. Climatology with a month or date: the lookup-table
 * model's RMSE against radiosondes, about 0.7 km; without one (annual mean): the same paper's RMSE
 * of its model without the seasonal table, about 0.9 km (Mateus, Mendes & Pires 2022, Remote Sensing
 * 14, 4303). A sounding or a given value: from memory, a WMO tropopause from a nearby sounding is
 * within a few hundred metres, a forecast or given value about half a kilometre.
 */
export const TROPOPAUSE_SIGMA_M = Object.freeze({
  climatologyMonth: 700,
  climatologyAnnual: 900,
  sounding: 300,
  given: 500,
});

/**
 * Scatter of a cruise EI NOx about its estimate, 1 sigma of ln EI. Fuel-flow methods: from memory,
 * in-flight measurements scatter about BFFM2 / DLR estimates by roughly 10-20 %, so 0.15; a direct
 * EI given with the flight (usually itself from a method or a measurement): 0.10, from memory.
 */
export const EI_LN_SIGMA = Object.freeze({ fuelFlowMethod: 0.15, direct: 0.1 });

/** Normal draws beyond this many sigma are held at it (a screening guard against absurd tails). */
const MAX_SIGMA = 3;

const NOTE =
  'Percentiles of Monte Carlo samples of the inputs listed, each with its own distribution, all other inputs at their central values. They leave out the structure of the model itself (one plume, no mixing, a fixed photostationary NO2 share, the residence-time picture) and the difference between gross catalytic loss and the net change of the ozone column: the ozone figure stays a gross loss. The tropopause error is taken as one shift for the whole flight (fully correlated along the route) and every input is drawn independently of the others.';

const DRIVER_METHOD =
  'One-at-a-time: the variance of the figure when only that input is sampled (the same draws, the others at their central values), as a share of the sum over the inputs; interactions between inputs are not counted.';

/** One sample's value of every sampled input (central values where an input is not sampled). */
export interface Draw {
  eiU: number;
  eiZ: number;
  shiftM: number;
  tauFactor: number;
  jO3: number;
  jNo2: number;
  noy: number;
  /** Daylight factor given with the flight, or NaN: derived from solar geometry. */
  daylight: number;
}

/** Per-segment data the samples re-use. */
export interface Kernel {
  n: number;
  nox: Float64Array;
  level: Int32Array;
  altM: Float64Array;
  tpM: Float64Array;
  /** d(tropopause pressure altitude) / d(tropopause height): 1 for given values, from the column for climatology. */
  slope: Float64Array;
  lat: Float64Array;
  /** kNO+O3 [O3] and kNO2+O [O]/J(O3): the loss per NOx molecule-year is rebuilt from these for any J and NOx/NOy. */
  a: Float64Array;
  b: Float64Array;
  tau0: Float64Array;
  cos0: Float64Array;
  day0: Float64Array;
  /** Per level: BFFM2 and DLR EI over the EI used (NaN for a direct EI). */
  ratioB: Float64Array;
  ratioD: Float64Array;
  eiUsed: Float64Array;
  direct: boolean;
  doy: number | null;
  inputs: OzoneInputs;
  central: Draw;
  sigmaShiftM: number;
}

function chemistryState(
  level: ScreeningLevel,
  slot: number,
  inputs: OzoneInputs,
): { t: number; m: number; o3: number } {
  const custom =
    typeof inputs.ozoneProfile === 'object' && inputs.ozoneProfile !== null ? inputs.ozoneProfile : undefined;
  const zKm = geometricFromGeopotentialM(level.altitudeM) / 1000;
  const c = chemistryAt(level.pressureHpa * 100, slot, level.temperatureK, level.temperatureSource === 'sounding', zKm);
  return { t: c.t, m: c.m, o3: ozonePpmv(slot, c.zKm, custom) };
}

/** The per-segment data of a full screening result (also used by the fleet sampling). */
export function buildKernel(input: ScreeningInput, result: ScreeningResult): Kernel {
  const inputs = resolveOzoneInputs(input.assumptions);
  const segs = result.segments;
  const n = segs.length;
  const op = inputs.ozoneProfile;
  const fixedSlot = op === null ? -1 : typeof op === 'string' ? OZONE_PROFILE_NAMES.indexOf(op) : CUSTOM_PROFILE_SLOT;
  const levels = result.levels;
  const levelIndex = new Map<number, number>();
  levels.forEach((l, i) => levelIndex.set(l.flightLevel, i));
  const direct = result.eiMethod === 'direct';
  const ratioB = new Float64Array(levels.length);
  const ratioD = new Float64Array(levels.length);
  const eiUsed = new Float64Array(levels.length);
  levels.forEach((l, i) => {
    eiUsed[i] = l.eiNoxGPerKg;
    ratioB[i] = !direct && l.eiNoxGPerKg > 0 && l.eiBffm2GPerKg !== null ? l.eiBffm2GPerKg / l.eiNoxGPerKg : Number.NaN;
    ratioD[i] = !direct && l.eiNoxGPerKg > 0 && l.eiDlrGPerKg !== null ? l.eiDlrGPerKg / l.eiNoxGPerKg : Number.NaN;
  });
  const k: Kernel = {
    n,
    nox: new Float64Array(n),
    level: new Int32Array(n),
    altM: new Float64Array(n),
    tpM: new Float64Array(n),
    slope: new Float64Array(n),
    lat: new Float64Array(n),
    a: new Float64Array(n),
    b: new Float64Array(n),
    tau0: new Float64Array(n),
    cos0: new Float64Array(n),
    day0: new Float64Array(n),
    ratioB,
    ratioD,
    eiUsed,
    direct,
    doy: result.dayOfYear,
    inputs,
    central: {
      eiU: Number.NaN,
      eiZ: 0,
      shiftM: 0,
      tauFactor: 1,
      jO3: inputs.jO3NoonPerS.central,
      jNo2: inputs.jNo2NoonPerS.central,
      noy: inputs.noxToNoyFraction.central,
      daylight: inputs.daylightFactor === null ? Number.NaN : inputs.daylightFactor.central,
    },
    sigmaShiftM:
      result.tropopauseSource === 'climatology'
        ? result.month === null
          ? TROPOPAUSE_SIGMA_M.climatologyAnnual
          : TROPOPAUSE_SIGMA_M.climatologyMonth
        : result.tropopauseSource === 'sounding'
          ? TROPOPAUSE_SIGMA_M.sounding
          : TROPOPAUSE_SIGMA_M.given,
  };
  const coefCache = new Map<number, Float64Array>();
  const sun: WindowSunlight = {
    dayFraction: 0,
    meanCosZenith: 0,
    daytimeCosZenith: 0,
    sunlitFraction: 0,
    activeShare: 1,
  };
  const jc = inputs.jO3NoonPerS.central;
  const jnc = inputs.jNo2NoonPerS.central;
  const fc = inputs.noxToNoyFraction.central;
  for (let i = 0; i < n; i++) {
    const s = segs[i];
    const li = levelIndex.get(s.flightLevel) ?? 0;
    const bandSlot = profileSlotFor(s.lat, result.month);
    const slot = fixedSlot >= 0 ? fixedSlot : bandSlot;
    k.nox[i] = s.noxKg;
    k.level[i] = li;
    k.altM[i] = s.altitudeM;
    k.tpM[i] = s.tropopauseM;
    k.lat[i] = s.lat;
    if (s.tropopauseSource === 'climatology') {
      // The derivative only: taken in the segment's band-and-season column whatever the ozone profile.
      const col = COLUMNS[bandSlot];
      const h = columnAtPressure(col, s.tropopausePressureHpa * 100).heightKm;
      k.slope[i] =
        (isaPressureAltitudeAt(columnPressurePa(col, h + 0.1)) -
          isaPressureAltitudeAt(columnPressurePa(col, h - 0.1))) /
        200;
    } else {
      k.slope[i] = 1;
    }
    const key = li * 16 + slot;
    let c = coefCache.get(key);
    if (c === undefined) {
      c = new Float64Array(COEFFICIENT_COUNT);
      const st = chemistryState(levels[li], slot, inputs);
      ozoneLossCoefficients(st.t, st.m, st.o3, inputs, c);
      coefCache.set(key, c);
    }
    const r0 = c[3];
    const bk = r0 > 0 && jc > 0 && fc > 0 ? c[0] / (2 * jc * r0 * fc * SECONDS_PER_YEAR) : 0;
    k.b[i] = bk;
    k.a[i] = r0 * (jnc + bk * jc);
    if (s.aboveTropopause) {
      const depth = (s.altitudeM - s.tropopauseM) / 1000;
      const tau = residenceTimeYears(depth, inputs.residenceTime, s.lat);
      windowSunlight(s.lat, result.dayOfYear, tau, sun);
      k.tau0[i] = tau;
      k.cos0[i] = sun.daytimeCosZenith;
      k.day0[i] = sun.dayFraction;
    }
  }
  return k;
}

export interface Figures {
  noxAbove: number;
  noxTotal: number;
  o3Molecules: number;
}

const SCRATCH_SUN: WindowSunlight = {
  dayFraction: 0,
  meanCosZenith: 0,
  daytimeCosZenith: 0,
  sunlitFraction: 0,
  activeShare: 1,
};

function levelRatios(k: Kernel, d: Draw, out: Float64Array): void {
  const cap = SCREENING_LIMITS.maxEiNoxGPerKg;
  const scatter = Math.exp((k.direct ? EI_LN_SIGMA.direct : EI_LN_SIGMA.fuelFlowMethod) * d.eiZ);
  for (let l = 0; l < out.length; l++) {
    let r = scatter;
    const rb = k.ratioB[l];
    const rd = k.ratioD[l];
    if (!Number.isNaN(d.eiU) && rb > 0 && rd > 0) r *= Math.exp((1 - d.eiU) * Math.log(rb) + d.eiU * Math.log(rd));
    const ei = k.eiUsed[l];
    out[l] = ei > 0 && ei * r > cap ? cap / ei : r;
  }
}

/** O3 molecules destroyed by `nox` kg at segment i for one set of J, NOx/NOy and residence factor. */
function lossMolecules(k: Kernel, i: number, nox: number, tau: number, s: number, day: number, d: Draw): number {
  const bk = k.b[i];
  const den = d.jNo2 + bk * d.jO3;
  if (!(den > 0) || !(s > 0)) return 0;
  const r0 = k.a[i] / den;
  const big = 2 * bk * d.jO3 * r0 * d.noy * SECONDS_PER_YEAR * d.tauFactor;
  return noxMolecules(nox) * tau * ((big * s * day) / (s + r0));
}

function clear(f: Figures): void {
  f.noxAbove = 0;
  f.noxTotal = 0;
  f.o3Molecules = 0;
}

/**
 * One sample in one pass over the segments: `full` with every draw in `d`; with `tp`, the same
 * tropopause shift with every other input central (sharing the shifted residence and sunlight);
 * with `sun`, only the J values and a given daylight factor of `d`, at the central tropopause.
 */
export function evaluate(
  k: Kernel,
  d: Draw,
  ratios: Float64Array,
  full: Figures,
  tp: Figures | null = null,
  sun: Figures | null = null,
): void {
  levelRatios(k, d, ratios);
  const shifted = d.shiftM !== 0;
  const rt = k.inputs.residenceTime;
  const c = k.central;
  const sunDraw: Draw | null = sun === null ? null : { ...c, jO3: d.jO3, jNo2: d.jNo2, daylight: d.daylight };
  clear(full);
  if (tp !== null) clear(tp);
  if (sun !== null) clear(sun);
  for (let i = 0; i < k.n; i++) {
    const nox0 = k.nox[i];
    const nox = nox0 * ratios[k.level[i]];
    full.noxTotal += nox;
    if (tp !== null) tp.noxTotal += nox0;
    if (sun !== null && sunDraw !== null) {
      sun.noxTotal += nox0;
      if (k.tau0[i] > 0) {
        sun.noxAbove += nox0;
        const day = Number.isNaN(d.daylight) ? k.day0[i] : d.daylight;
        sun.o3Molecules += lossMolecules(k, i, nox0, k.tau0[i], k.cos0[i], day, sunDraw);
      }
    }
    const tpM = shifted ? k.tpM[i] + d.shiftM * k.slope[i] : k.tpM[i];
    if (!(k.altM[i] > tpM)) continue;
    let tau: number;
    let s: number;
    let day: number;
    if (shifted || k.tau0[i] === 0) {
      const lat = k.lat[i];
      tau = residenceTimeYears((k.altM[i] - tpM) / 1000, rt, lat);
      windowSunlight(lat, k.doy, tau, SCRATCH_SUN);
      s = SCRATCH_SUN.daytimeCosZenith;
      day = SCRATCH_SUN.dayFraction;
    } else {
      tau = k.tau0[i];
      s = k.cos0[i];
      day = k.day0[i];
    }
    full.noxAbove += nox;
    full.o3Molecules += lossMolecules(k, i, nox, tau, s, Number.isNaN(d.daylight) ? day : d.daylight, d);
    if (tp !== null) {
      tp.noxAbove += nox0;
      tp.o3Molecules += lossMolecules(k, i, nox0, tau, s, Number.isNaN(c.daylight) ? day : c.daylight, c);
    }
  }
}

/**
 * NOx above the tropopause (kg) and the ozone figure (O3 molecules) with every input central, at each
 * tropopause shift `shift0M + j * stepM` (j < nodes), into `noxOut` and `o3Out` (added to). Equal to
 * `evaluate` at each shift, except that a segment's loss is computed exactly only at every `stride`-th
 * node where it lies above (and at its last) and linearly interpolated between: the loss varies
 * smoothly with the depth above the tropopause, and the residence-time and sunlight look-ups are
 * what a component build spends its time on.
 */
export function shiftCurves(
  k: Kernel,
  shift0M: number,
  stepM: number,
  nodes: number,
  stride: number,
  noxOut: Float64Array,
  o3Out: Float64Array,
): void {
  const ratios = new Float64Array(k.eiUsed.length);
  const c = k.central;
  levelRatios(k, c, ratios);
  const rt = k.inputs.residenceTime;
  const lossAt = (i: number, nox: number, tpM: number): number => {
    const lat = k.lat[i];
    const tau = residenceTimeYears((k.altM[i] - tpM) / 1000, rt, lat);
    windowSunlight(lat, k.doy, tau, SCRATCH_SUN);
    const day = Number.isNaN(c.daylight) ? SCRATCH_SUN.dayFraction : c.daylight;
    return lossMolecules(k, i, nox, tau, SCRATCH_SUN.daytimeCosZenith, day, c);
  };
  for (let i = 0; i < k.n; i++) {
    const nox = k.nox[i] * ratios[k.level[i]];
    let prevJ = -1;
    let prevV = 0;
    for (let j = 0; j < nodes; j++) {
      const tpM = k.tpM[i] + (shift0M + j * stepM) * k.slope[i];
      if (!(k.altM[i] > tpM)) continue;
      noxOut[j] += nox;
      const lastAbove = j === nodes - 1 || !(k.altM[i] > k.tpM[i] + (shift0M + (j + 1) * stepM) * k.slope[i]);
      if (prevJ >= 0 && j - prevJ < stride && !lastAbove) continue;
      const v = lossAt(i, nox, tpM);
      o3Out[j] += v;
      if (prevJ >= 0 && j - prevJ > 1) {
        // Fill the nodes skipped since the last exact one, all above (the range above is contiguous).
        for (let m = prevJ + 1; m < j; m++) o3Out[m] += prevV + ((m - prevJ) / (j - prevJ)) * (v - prevV);
      }
      prevJ = j;
      prevV = v;
    }
  }
}

/** A standard normal draw held within MAX_SIGMA. */
export function heldNormal(u: Uniform): number {
  let z = standardNormal(u);
  if (z > MAX_SIGMA) z = MAX_SIGMA;
  else if (z < -MAX_SIGMA) z = -MAX_SIGMA;
  return z;
}

/** Draws every input for sample i from its own stream (each stream advances the same way for every sample). */
function drawAll(k: Kernel, streams: Uniform[], on: ReadonlySet<UncertainInput>): Draw {
  const inp = k.inputs;
  const d: Draw = { ...k.central };
  const ei = streams[0];
  const eiU = ei();
  const eiZ = heldNormal(ei);
  if (on.has('cruise-ei')) {
    d.eiU = k.direct ? Number.NaN : eiU;
    d.eiZ = eiZ;
  }
  const tpZ = heldNormal(streams[1]);
  if (on.has('tropopause')) d.shiftM = tpZ * k.sigmaShiftM;
  const rtP = streams[2]();
  if (on.has('residence-time')) {
    const lo = Math.log(inp.residenceTime.lowFactor);
    const hi = Math.log(inp.residenceTime.highFactor);
    d.tauFactor = Math.exp(triangular(rtP, lo, 0, hi));
  }
  const sl = streams[3];
  const p1 = sl();
  const p2 = sl();
  const p3 = sl();
  if (on.has('sunlight')) {
    const j = inp.jO3NoonPerS;
    const jn = inp.jNo2NoonPerS;
    d.jO3 = triangular(p1, j.low, j.central, j.high);
    d.jNo2 = triangular(p2, jn.low, jn.central, jn.high);
    const dl = inp.daylightFactor;
    if (dl !== null) d.daylight = triangular(p3, dl.low, dl.central, dl.high);
  }
  const fP = streams[4]();
  if (on.has('nox-noy')) {
    const f = inp.noxToNoyFraction;
    d.noy = triangular(fP, f.low, f.central, f.high);
  }
  return d;
}

export function percentiles(values: Float64Array): Percentiles {
  const s = Float64Array.from(values).sort();
  return { p5: percentileSorted(s, 0.05), p50: percentileSorted(s, 0.5), p95: percentileSorted(s, 0.95) };
}

function variance(values: Float64Array): number {
  const n = values.length;
  if (n < 2) return 0;
  let m = 0;
  let lo = values[0];
  let hi = values[0];
  for (let i = 0; i < n; i++) {
    m += values[i];
    if (values[i] < lo) lo = values[i];
    else if (values[i] > hi) hi = values[i];
  }
  // A constant figure has no spread; summing it would leave a rounding residue instead of 0.
  if (lo === hi) return 0;
  m /= n;
  let v = 0;
  for (let i = 0; i < n; i++) v += (values[i] - m) * (values[i] - m);
  return v / (n - 1);
}

interface Runs {
  noxAbove: Float64Array;
  fraction: Float64Array;
  o3: Float64Array;
}

function runs(samples: number): Runs {
  return { noxAbove: new Float64Array(samples), fraction: new Float64Array(samples), o3: new Float64Array(samples) };
}

function store(r: Runs, i: number, noxAbove: number, noxTotal: number, o3Molecules: number): void {
  r.noxAbove[i] = noxAbove;
  r.fraction[i] = noxTotal > 0 ? Math.min(1, noxAbove / noxTotal) : 0;
  r.o3[i] = ozoneKg(o3Molecules);
}

/** The central figures by cruise level: NOx above, NOx total and O3 molecules, for the linear one-at-a-time runs. */
function centralByLevel(k: Kernel): { above: Float64Array; total: Float64Array; o3: Float64Array } {
  const nl = k.eiUsed.length;
  const out = { above: new Float64Array(nl), total: new Float64Array(nl), o3: new Float64Array(nl) };
  const c = k.central;
  for (let i = 0; i < k.n; i++) {
    const l = k.level[i];
    out.total[l] += k.nox[i];
    if (k.tau0[i] > 0) {
      out.above[l] += k.nox[i];
      out.o3[l] += lossMolecules(
        k,
        i,
        k.nox[i],
        k.tau0[i],
        k.cos0[i],
        Number.isNaN(c.daylight) ? k.day0[i] : c.daylight,
        c,
      );
    }
  }
  return out;
}

/**
 * All samples, and with `drivers` the one-at-a-time runs on the same draws: the tropopause and the
 * sunlight runs share the pass of the full sample; the EI, residence-time and NOx/NOy runs are exact
 * linear rescalings of the central figures (NOx per level scales with its EI; the loss is
 * proportional to the residence factor and to the NOx/NOy share).
 */
function run(
  k: Kernel,
  samples: number,
  seed: number,
  on: ReadonlySet<UncertainInput>,
  drivers: boolean,
): { all: Runs; oat: Map<UncertainInput, Runs> } {
  const streams = UNCERTAIN_INPUTS.map((_, g) => mulberry32(subSeed(seed, g)));
  const ratios = new Float64Array(k.eiUsed.length);
  const eiRatios = new Float64Array(k.eiUsed.length);
  const full: Figures = { noxAbove: 0, noxTotal: 0, o3Molecules: 0 };
  const tpFig: Figures = { noxAbove: 0, noxTotal: 0, o3Molecules: 0 };
  const sunFig: Figures = { noxAbove: 0, noxTotal: 0, o3Molecules: 0 };
  const all = runs(samples);
  const oat = new Map<UncertainInput, Runs>();
  if (drivers) for (const g of UNCERTAIN_INPUTS) if (on.has(g)) oat.set(g, runs(samples));
  const byLevel = drivers ? centralByLevel(k) : null;
  let cAbove = 0;
  let cTotal = 0;
  let cO3 = 0;
  if (byLevel !== null) {
    for (let l = 0; l < byLevel.above.length; l++) {
      cAbove += byLevel.above[l];
      cTotal += byLevel.total[l];
      cO3 += byLevel.o3[l];
    }
  }
  const tpRuns = oat.get('tropopause') ?? null;
  const sunRuns = oat.get('sunlight') ?? null;
  const c = k.central;
  for (let i = 0; i < samples; i++) {
    const d = drawAll(k, streams, on);
    evaluate(k, d, ratios, full, tpRuns === null ? null : tpFig, sunRuns === null ? null : sunFig);
    store(all, i, full.noxAbove, full.noxTotal, full.o3Molecules);
    if (tpRuns !== null) store(tpRuns, i, tpFig.noxAbove, tpFig.noxTotal, tpFig.o3Molecules);
    if (sunRuns !== null) store(sunRuns, i, sunFig.noxAbove, sunFig.noxTotal, sunFig.o3Molecules);
    if (byLevel === null) continue;
    const eiRuns = oat.get('cruise-ei');
    if (eiRuns !== undefined) {
      levelRatios(k, { ...c, eiU: d.eiU, eiZ: d.eiZ }, eiRatios);
      let a = 0;
      let t = 0;
      let o = 0;
      for (let l = 0; l < eiRatios.length; l++) {
        a += byLevel.above[l] * eiRatios[l];
        t += byLevel.total[l] * eiRatios[l];
        o += byLevel.o3[l] * eiRatios[l];
      }
      store(eiRuns, i, a, t, o);
    }
    const rtRuns = oat.get('residence-time');
    if (rtRuns !== undefined) store(rtRuns, i, cAbove, cTotal, cO3 * d.tauFactor);
    const noyRuns = oat.get('nox-noy');
    if (noyRuns !== undefined) store(noyRuns, i, cAbove, cTotal, c.noy > 0 ? (cO3 * d.noy) / c.noy : 0);
  }
  return { all, oat };
}

function distributions(k: Kernel, result: ScreeningResult, on: ReadonlySet<UncertainInput>): SampledDistribution[] {
  const inp = k.inputs;
  const all: SampledDistribution[] = [
    {
      input: 'cruise-ei',
      label: LABELS['cruise-ei'],
      distribution: k.direct
        ? `EI x lognormal, sigma of ln EI ${EI_LN_SIGMA.direct}`
        : `ln EI uniform between the BFFM2 and the DLR estimate at each level, then x lognormal scatter, sigma of ln EI ${EI_LN_SIGMA.fuelFlowMethod}; at most ${SCREENING_LIMITS.maxEiNoxGPerKg} g/kg`,
      source: k.direct
        ? 'Scatter from memory: a given cruise EI is itself an estimate or a measurement; confirm against the source of the value.'
        : 'Method spread: BFFM2 (DuBois & Paynter 2006, SAE 2006-01-1987) vs DLR (Deidewig, Doepelheuer & Lecht 1996) as computed for this flight; scatter of in-flight measurements about them from memory (roughly 10-20 %).',
    },
    {
      input: 'tropopause',
      label: LABELS.tropopause,
      distribution: `one height shift for the whole flight, normal with sigma ${k.sigmaShiftM / 1000} km (held within ${MAX_SIGMA} sigma), placed in pressure through the same column`,
      source:
        result.tropopauseSource === 'climatology'
          ? `Mateus, Mendes & Pires (2022), Remote Sensing 14, 4303: RMSE about ${result.month === null ? '0.9 km of the model without the seasonal table (no month or date given)' : '0.7 km of the lookup-table model'} against radiosondes.`
          : result.tropopauseSource === 'sounding'
            ? 'From memory: a WMO tropopause from a sounding near the flight in time and place is good to a few hundred metres.'
            : 'From memory: a forecast or given tropopause is good to about half a kilometre.',
    },
    {
      input: 'residence-time',
      label: LABELS['residence-time'],
      distribution: `residence time x a factor whose logarithm is triangular between ln ${inp.residenceTime.lowFactor} and ln ${inp.residenceTime.highFactor}, mode 1 (as the band applies it)`,
      source: "The screening band's own residence factors (low and high ends as the limits).",
    },
    {
      input: 'sunlight',
      label: LABELS.sunlight,
      distribution: `J(O3) and J(NO2) each triangular between the band's low and high with the central value as the mode, drawn independently${inp.daylightFactor === null ? '; the daylight factor comes from solar geometry and is not sampled' : '; the given daylight factor likewise'}`,
      source:
        "The screening band's own J values (from memory; overhead-sun references scaled by the daytime-mean cos zenith).",
    },
    {
      input: 'nox-noy',
      label: LABELS['nox-noy'],
      distribution: `triangular between ${inp.noxToNoyFraction.low} and ${inp.noxToNoyFraction.high}, mode ${inp.noxToNoyFraction.central}`,
      source: "The screening band's own NOx/NOy share (from memory).",
    },
  ];
  return all.filter((d) => on.has(d.input));
}

function rank(shares: Map<UncertainInput, number>): Driver[] {
  let total = 0;
  for (const v of shares.values()) total += v;
  return [...shares.entries()]
    .map(([input, v]) => ({ input, label: LABELS[input], share: total > 0 ? v / total : 0 }))
    .sort((x, y) => y.share - x.share || UNCERTAIN_INPUTS.indexOf(x.input) - UNCERTAIN_INPUTS.indexOf(y.input));
}

/**
 * Samples a finished screening's uncertain inputs: `samples` (50..5000, default 400) Monte Carlo
 * draws from `seed` (default 1; the same input and seed give the same percentiles, bit for bit).
 * `result` must be `screenValidated(input)` (with its segments). Returns the 5/50/95th percentiles of
 * NOx above the tropopause (kg), the share of NOx above and the ozone figure (kg O3), which ozone
 * percentiles fall outside the all-corners range, the distributions used and the drivers.
 */
export function sampleUncertainty(
  input: ScreeningInput,
  result: ScreeningResult,
  options: SampleOptions = {},
): ScreeningUncertainty {
  const samples = options.samples ?? input.uncertainty?.samples ?? DEFAULT_UNCERTAINTY_SAMPLES;
  const seed = options.seed ?? input.uncertainty?.seed ?? DEFAULT_UNCERTAINTY_SEED;
  const on = new Set<UncertainInput>(options.only ?? UNCERTAIN_INPUTS);
  const k = buildKernel(input, result);
  const { all, oat } = run(k, samples, seed, on, options.drivers !== false);
  const ozone = percentiles(all.o3);
  const outside: ScreeningUncertainty['outsideScreeningRange'] = [];
  const lo = result.ozoneLoss.lowKg;
  const hi = result.ozoneLoss.highKg;
  const tol = 1e-9 * Math.max(hi, 1e-30);
  for (const q of ['p5', 'p50', 'p95'] as const) if (ozone[q] < lo - tol || ozone[q] > hi + tol) outside.push(q);
  const noxShares = new Map<UncertainInput, number>();
  const fracShares = new Map<UncertainInput, number>();
  const o3Shares = new Map<UncertainInput, number>();
  for (const [g, r] of oat) {
    noxShares.set(g, variance(r.noxAbove));
    fracShares.set(g, variance(r.fraction));
    o3Shares.set(g, variance(r.o3));
  }
  return {
    samples,
    seed,
    noxAboveTropopauseKg: percentiles(all.noxAbove),
    fractionAboveTropopause: percentiles(all.fraction),
    ozoneLossKg: ozone,
    outsideScreeningRange: outside,
    sampled: distributions(k, result, on),
    drivers: {
      method: DRIVER_METHOD,
      noxAboveTropopauseKg: rank(noxShares),
      fractionAboveTropopause: rank(fracShares),
      ozoneLossKg: rank(o3Shares),
    },
    note:
      outside.length > 0
        ? `${NOTE} The ozone ${outside.join(', ')} lie${outside.length === 1 ? 's' : ''} outside the all-corners screening range: the tropopause height or the EI, which that range holds fixed, moves ${outside.length === 1 ? 'it' : 'them'} there.`
        : NOTE,
  };
}

/**
 * The figures with every sampled input at its central value, evaluated by the sampling's own formula:
 * equal to the screening's figures (a guard that the sampling rebuilds the engine's loss exactly).
 */
export function centralFigures(
  input: ScreeningInput,
  result: ScreeningResult,
): { noxAboveTropopauseKg: number; ozoneLossKg: number } {
  const k = buildKernel(input, result);
  const fig: Figures = { noxAbove: 0, noxTotal: 0, o3Molecules: 0 };
  evaluate(k, k.central, new Float64Array(k.eiUsed.length), fig);
  return { noxAboveTropopauseKg: fig.noxAbove, ozoneLossKg: ozoneKg(fig.o3Molecules) };
}

/** The raw samples behind `sampleUncertainty` (no drivers): NOx above (kg), share above and the ozone figure (kg), one entry a sample. */
export function sampleFigures(
  input: ScreeningInput,
  result: ScreeningResult,
  options: Omit<SampleOptions, 'drivers'> = {},
): { noxAboveTropopauseKg: Float64Array; fractionAboveTropopause: Float64Array; ozoneLossKg: Float64Array } {
  const samples = options.samples ?? input.uncertainty?.samples ?? DEFAULT_UNCERTAINTY_SAMPLES;
  const seed = options.seed ?? input.uncertainty?.seed ?? DEFAULT_UNCERTAINTY_SEED;
  const { all } = run(
    buildKernel(input, result),
    samples,
    seed,
    new Set<UncertainInput>(options.only ?? UNCERTAIN_INPUTS),
    false,
  );
  return { noxAboveTropopauseKg: all.noxAbove, fractionAboveTropopause: all.fraction, ozoneLossKg: all.o3 };
}
