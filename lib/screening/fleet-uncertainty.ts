/**
 * Percentiles of a fleet's totals (issue 12, items 5-6, engine part). A total is not the sum of the
 * flights' percentiles: in one sample the systematic inputs are shared by every flight. Each flight
 * keeps small components once (NOx above and the ozone figure on a grid of tropopause shifts, the
 * ozone figure's response to the J values, its EI method spread), so a sample is a weighted sum over
 * the flights, never a re-screening. Masses in kg (NOx as NO2, O3), shifts in m.
 */
import { ozoneKg } from './ozone-loss';
import { mulberry32, standardNormal, subSeed, triangular, type Uniform } from './prng';
import type { ScreeningResult } from './screen-flight';
import {
  DEFAULT_UNCERTAINTY_SAMPLES,
  DEFAULT_UNCERTAINTY_SEED,
  EI_LN_SIGMA,
  buildKernel,
  evaluate,
  percentiles,
  type Draw,
  type Figures,
  type Kernel,
  type Percentiles,
} from './uncertainty';
import type { ScreeningInput } from '../validation/screening';

/** Tropopause-shift grid of the components: -3000..3000 m by 100 m (3 sigma of the widest spread is 2.7 km). */
export const FLEET_SHIFT_STEP_M = 100;
export const FLEET_SHIFT_NODES = 61;
const SHIFT_MIN_M = -((FLEET_SHIFT_NODES - 1) / 2) * FLEET_SHIFT_STEP_M;

/**
 * Share of a flight's tropopause error that its region and month share (the rest is its own):
 * an assumption of this screening, not a published figure. Region: 10-degree band of the flight's
 * NOx-weighted latitude; month: the flight's month (annual-mean flights form their own group).
 */
export const SHARED_TROPOPAUSE_VARIANCE = 0.5;

/** What one flight keeps for the fleet sampling (about 0.6 kB). */
export interface FlightComponents {
  noxTotalKg: number;
  /** NOx above the tropopause (central EI) at each shift of the tropopause height, kg. */
  noxAboveKg: Float32Array;
  /** Ozone figure (every other input central) at each shift, kg O3. */
  o3Kg: Float32Array;
  /** Ozone figure at J(O3) in {low, central, high} x J(NO2) in {low, central, high} over the central one, at the central tropopause. */
  jRatio: Float32Array;
  /** Band of the flight's J(O3), J(NO2), NOx/NOy and residence factors: the shared quantiles are read on them. */
  jO3: [number, number, number];
  jNo2: [number, number, number];
  noy: [number, number, number];
  residenceFactor: [number, number];
  /** NOx-weighted ln(BFFM2 EI / EI used) and ln(DLR EI / EI used); NaN for a direct EI. */
  lnEiB: number;
  lnEiD: number;
  direct: boolean;
  sigmaShiftM: number;
  /** Region-month group of the shared tropopause error. */
  group: number;
}

function central(k: Kernel, patch: Partial<Draw>): Draw {
  return { ...k.central, ...patch };
}

/** The components of one screened flight (`result` = `screenValidated(input)`, with its segments). */
export function flightComponents(input: ScreeningInput, result: ScreeningResult): FlightComponents {
  const k = buildKernel(input, result);
  const ratios = new Float64Array(k.eiUsed.length);
  const f: Figures = { noxAbove: 0, noxTotal: 0, o3Molecules: 0 };
  const noxAboveKg = new Float32Array(FLEET_SHIFT_NODES);
  const o3Kg = new Float32Array(FLEET_SHIFT_NODES);
  for (let j = 0; j < FLEET_SHIFT_NODES; j++) {
    evaluate(k, central(k, { shiftM: SHIFT_MIN_M + j * FLEET_SHIFT_STEP_M }), ratios, f);
    noxAboveKg[j] = f.noxAbove;
    o3Kg[j] = ozoneKg(f.o3Molecules);
  }
  const inp = k.inputs;
  const j3 = inp.jO3NoonPerS;
  const j2 = inp.jNo2NoonPerS;
  const jO3: [number, number, number] = [j3.low, j3.central, j3.high];
  const jNo2: [number, number, number] = [j2.low, j2.central, j2.high];
  evaluate(k, k.central, ratios, f);
  const o3c = f.o3Molecules;
  const noxTotal = f.noxTotal;
  const jRatio = new Float32Array(9);
  for (let a = 0; a < 3; a++) {
    for (let b = 0; b < 3; b++) {
      evaluate(k, central(k, { jO3: jO3[a], jNo2: jNo2[b] }), ratios, f);
      jRatio[a * 3 + b] = o3c > 0 ? f.o3Molecules / o3c : 1;
    }
  }
  let w = 0;
  let lb = 0;
  let ld = 0;
  let lat = 0;
  for (let i = 0; i < k.n; i++) {
    const l = k.level[i];
    w += k.nox[i];
    lat += k.nox[i] * k.lat[i];
    if (!k.direct) {
      lb += k.nox[i] * Math.log(k.ratioB[l]);
      ld += k.nox[i] * Math.log(k.ratioD[l]);
    }
  }
  const meanLat = w > 0 ? lat / w : k.n > 0 ? k.lat[0] : 0;
  const band = Math.min(17, Math.max(0, Math.floor((meanLat + 90) / 10)));
  return {
    noxTotalKg: noxTotal,
    noxAboveKg,
    o3Kg,
    jRatio,
    jO3,
    jNo2,
    noy: [inp.noxToNoyFraction.low, inp.noxToNoyFraction.central, inp.noxToNoyFraction.high],
    residenceFactor: [inp.residenceTime.lowFactor, inp.residenceTime.highFactor],
    lnEiB: k.direct || !(w > 0) ? Number.NaN : lb / w,
    lnEiD: k.direct || !(w > 0) ? Number.NaN : ld / w,
    direct: k.direct,
    sigmaShiftM: k.sigmaShiftM,
    group: band * 13 + (result.month ?? 0),
  };
}

/** Percentiles of a fleet's totals. */
export interface FleetUncertainty {
  samples: number;
  seed: number;
  flights: number;
  noxAboveTropopauseKg: Percentiles;
  fractionAboveTropopause: Percentiles;
  ozoneLossKg: Percentiles;
  correlation: string;
}

const CORRELATION =
  "In each sample the systematic inputs are shared by every flight: the EI method (one position between BFFM2 and DLR), the residence-time factor, the J values and the NOx/NOy share (one quantile each, read on each flight's own band). The tropopause error is half shared within a region and month (10-degree band of the flight's NOx-weighted latitude, the flight's month) and half the flight's own; the EI scatter about the methods is each flight's own.";

const GROUPS = 18 * 13;

/** One sample's shared draws and the per-flight stream, the same for the component and the exact sums. */
interface FleetSample {
  u: number;
  tauFactorQ: number;
  jO3Q: number;
  jNo2Q: number;
  noyQ: number;
  groupZ: Float64Array;
}

function drawShared(shared: Uniform, groups: Uniform, out: FleetSample): void {
  out.u = shared();
  out.tauFactorQ = shared();
  out.jO3Q = shared();
  out.jNo2Q = shared();
  out.noyQ = shared();
  for (let g = 0; g < GROUPS; g++) out.groupZ[g] = standardNormal(groups);
}

const SHARED_A = Math.sqrt(SHARED_TROPOPAUSE_VARIANCE);
const OWN_B = Math.sqrt(1 - SHARED_TROPOPAUSE_VARIANCE);

/**
 * The flight's own draws into `out` [tropopause z (shared part mixed in), EI scatter z]: both normals
 * of one Box-Muller pair, each held within 3 sigma.
 */
function drawOwn(own: Uniform, s: FleetSample, group: number, out: Float64Array): void {
  const r = Math.sqrt(-2 * Math.log(1 - own()));
  const th = 2 * Math.PI * own();
  let z1 = r * Math.cos(th);
  let z2 = r * Math.sin(th);
  z1 = z1 > 3 ? 3 : z1 < -3 ? -3 : z1;
  z2 = z2 > 3 ? 3 : z2 < -3 ? -3 : z2;
  let zTp = SHARED_A * s.groupZ[group] + OWN_B * z1;
  zTp = zTp > 3 ? 3 : zTp < -3 ? -3 : zTp;
  out[0] = zTp;
  out[1] = z2;
}

function bandValue(q: number, b: readonly [number, number, number]): number {
  return triangular(q, b[0], b[1], b[2]);
}

/** Position of x on three nodes as (cell index 0|1, fraction). */
function onNodes(x: number, n: readonly [number, number, number]): [number, number] {
  if (x <= n[1]) return [0, n[1] > n[0] ? (x - n[0]) / (n[1] - n[0]) : 1];
  return [1, n[2] > n[1] ? (x - n[1]) / (n[2] - n[1]) : 0];
}

function jFactor(c: FlightComponents, jO3: number, jNo2: number): number {
  const [ia, fa] = onNodes(jO3, c.jO3);
  const [ib, fb] = onNodes(jNo2, c.jNo2);
  const r = c.jRatio;
  const v00 = r[ia * 3 + ib];
  const v01 = r[ia * 3 + ib + 1];
  const v10 = r[(ia + 1) * 3 + ib];
  const v11 = r[(ia + 1) * 3 + ib + 1];
  return (1 - fa) * ((1 - fb) * v00 + fb * v01) + fa * ((1 - fb) * v10 + fb * v11);
}

function finish(
  samples: number,
  seed: number,
  flights: number,
  above: Float64Array,
  total: Float64Array,
  o3: Float64Array,
): FleetUncertainty {
  const frac = new Float64Array(samples);
  for (let i = 0; i < samples; i++) frac[i] = total[i] > 0 ? Math.min(1, above[i] / total[i]) : 0;
  return {
    samples,
    seed,
    flights,
    noxAboveTropopauseKg: percentiles(above),
    fractionAboveTropopause: percentiles(frac),
    ozoneLossKg: percentiles(o3),
    correlation: CORRELATION,
  };
}

/**
 * Percentiles of a fleet's total NOx above the tropopause (kg), share above and ozone figure (kg O3)
 * from the flights' components: `samples` (default 400) from `seed` (default 1), the correlation as
 * CORRELATION states. Cost: samples x flights weighted sums.
 */
export function sampleFleet(
  flights: readonly FlightComponents[],
  options: { samples?: number; seed?: number } = {},
): FleetUncertainty {
  const samples = options.samples ?? DEFAULT_UNCERTAINTY_SAMPLES;
  const seed = options.seed ?? DEFAULT_UNCERTAINTY_SEED;
  const shared = mulberry32(subSeed(seed, 100));
  const groups = mulberry32(subSeed(seed, 101));
  const own = mulberry32(subSeed(seed, 102));
  const s: FleetSample = { u: 0, tauFactorQ: 0, jO3Q: 0, jNo2Q: 0, noyQ: 0, groupZ: new Float64Array(GROUPS) };
  const above = new Float64Array(samples);
  const total = new Float64Array(samples);
  const o3 = new Float64Array(samples);
  const last = FLEET_SHIFT_NODES - 1;
  // Flights with the same bands read the shared quantiles the same way: work those out once a sample.
  const bandKey = (c: FlightComponents) => [...c.jO3, ...c.jNo2, ...c.noy, ...c.residenceFactor].join(',');
  const bandIds = new Map<string, number>();
  const bands: FlightComponents[] = [];
  const bandOf = new Int32Array(flights.length);
  flights.forEach((c, n) => {
    const key = bandKey(c);
    let id = bandIds.get(key);
    if (id === undefined) {
      id = bands.length;
      bandIds.set(key, id);
      bands.push(c);
    }
    bandOf[n] = id;
  });
  const bandTf = new Float64Array(bands.length);
  const bandNoy = new Float64Array(bands.length);
  const bandJ3 = new Float64Array(bands.length);
  const bandJ2 = new Float64Array(bands.length);
  const z = new Float64Array(2);
  for (let i = 0; i < samples; i++) {
    drawShared(shared, groups, s);
    for (let b = 0; b < bands.length; b++) {
      const c = bands[b];
      bandTf[b] = Math.exp(triangular(s.tauFactorQ, Math.log(c.residenceFactor[0]), 0, Math.log(c.residenceFactor[1])));
      bandNoy[b] = c.noy[1] > 0 ? bandValue(s.noyQ, c.noy) / c.noy[1] : 1;
      bandJ3[b] = bandValue(s.jO3Q, c.jO3);
      bandJ2[b] = bandValue(s.jNo2Q, c.jNo2);
    }
    let a = 0;
    let t = 0;
    let o = 0;
    for (let n = 0; n < flights.length; n++) {
      const c = flights[n];
      const b = bandOf[n];
      drawOwn(own, s, c.group, z);
      let x = (z[0] * c.sigmaShiftM - SHIFT_MIN_M) / FLEET_SHIFT_STEP_M;
      if (x < 0) x = 0;
      else if (x > last) x = last;
      const j = Math.min(last - 1, Math.floor(x));
      const fx = x - j;
      const noxA = c.noxAboveKg[j] + fx * (c.noxAboveKg[j + 1] - c.noxAboveKg[j]);
      const o3s = c.o3Kg[j] + fx * (c.o3Kg[j + 1] - c.o3Kg[j]);
      const lnMix = c.direct ? 0 : (1 - s.u) * c.lnEiB + s.u * c.lnEiD;
      const ei = Math.exp(lnMix + (c.direct ? EI_LN_SIGMA.direct : EI_LN_SIGMA.fuelFlowMethod) * z[1]);
      a += noxA * ei;
      t += c.noxTotalKg * ei;
      if (o3s > 0) o += o3s * ei * bandTf[b] * bandNoy[b] * jFactor(c, bandJ3[b], bandJ2[b]);
    }
    above[i] = a;
    total[i] = t;
    o3[i] = o;
  }
  return finish(samples, seed, flights.length, above, total, o3);
}

/**
 * The same fleet sampling by brute force: every flight of every sample evaluated exactly from its
 * segments with the same draws (for checking the components on a small fleet; slow for a large one).
 */
export function sampleFleetExact(
  screenings: readonly { input: ScreeningInput; result: ScreeningResult }[],
  options: { samples?: number; seed?: number } = {},
): FleetUncertainty {
  const samples = options.samples ?? DEFAULT_UNCERTAINTY_SAMPLES;
  const seed = options.seed ?? DEFAULT_UNCERTAINTY_SEED;
  const kernels = screenings.map((x) => buildKernel(x.input, x.result));
  const groupsOf = screenings.map((x) => flightComponents(x.input, x.result).group);
  const shared = mulberry32(subSeed(seed, 100));
  const groups = mulberry32(subSeed(seed, 101));
  const own = mulberry32(subSeed(seed, 102));
  const s: FleetSample = { u: 0, tauFactorQ: 0, jO3Q: 0, jNo2Q: 0, noyQ: 0, groupZ: new Float64Array(GROUPS) };
  const above = new Float64Array(samples);
  const total = new Float64Array(samples);
  const o3 = new Float64Array(samples);
  const f: Figures = { noxAbove: 0, noxTotal: 0, o3Molecules: 0 };
  const z = new Float64Array(2);
  for (let i = 0; i < samples; i++) {
    drawShared(shared, groups, s);
    for (let n = 0; n < kernels.length; n++) {
      const k = kernels[n];
      drawOwn(own, s, groupsOf[n], z);
      const d = { zTp: z[0], zEi: z[1] };
      const inp = k.inputs;
      const draw: Draw = {
        ...k.central,
        eiU: k.direct ? Number.NaN : s.u,
        eiZ: d.zEi,
        shiftM: d.zTp * k.sigmaShiftM,
        tauFactor: Math.exp(
          triangular(s.tauFactorQ, Math.log(inp.residenceTime.lowFactor), 0, Math.log(inp.residenceTime.highFactor)),
        ),
        jO3: triangular(s.jO3Q, inp.jO3NoonPerS.low, inp.jO3NoonPerS.central, inp.jO3NoonPerS.high),
        jNo2: triangular(s.jNo2Q, inp.jNo2NoonPerS.low, inp.jNo2NoonPerS.central, inp.jNo2NoonPerS.high),
        noy: triangular(s.noyQ, inp.noxToNoyFraction.low, inp.noxToNoyFraction.central, inp.noxToNoyFraction.high),
      };
      evaluate(k, draw, new Float64Array(k.eiUsed.length), f);
      above[i] += f.noxAbove;
      total[i] += f.noxTotal;
      o3[i] += ozoneKg(f.o3Molecules);
    }
  }
  return finish(samples, seed, screenings.length, above, total, o3);
}
