/**
 * Percentiles of a fleet's totals (issue 12, items 5-6, engine part). A total is not the sum of the
 * flights' percentiles: in one sample the systematic inputs are shared by every flight. Each flight
 * keeps small components once (NOx above and the ozone figure on a grid of tropopause shifts, the
 * ozone figure's response to the J values, its EI method spread), so a sample is a weighted sum over
 * the flights, never a re-screening. Masses in kg (NOx as NO2, O3), shifts in m.
 */
import { ozoneKg } from './ozone-loss';
import {
  NORMAL_TABLE_CELLS,
  mulberry32,
  normalQuantileTable,
  standardNormal,
  subSeed,
  triangular,
  type Uniform,
} from './prng';
import { screenValidated, type ScreeningResult, type ScreeningTotals } from './screen-flight';
import {
  DEFAULT_UNCERTAINTY_SAMPLES,
  DEFAULT_UNCERTAINTY_SEED,
  EI_LN_SIGMA,
  buildKernel,
  evaluate,
  percentiles,
  shiftCurves,
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
/** The ozone curve is computed exactly every this many nodes (500 m) and interpolated between. */
const SHIFT_STRIDE = 5;

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
  const nox64 = new Float64Array(FLEET_SHIFT_NODES);
  const o364 = new Float64Array(FLEET_SHIFT_NODES);
  shiftCurves(k, SHIFT_MIN_M, FLEET_SHIFT_STEP_M, FLEET_SHIFT_NODES, SHIFT_STRIDE, nox64, o364);
  const noxAboveKg = Float32Array.from(nox64);
  const o3Kg = new Float32Array(FLEET_SHIFT_NODES);
  for (let j = 0; j < FLEET_SHIFT_NODES; j++) o3Kg[j] = ozoneKg(o364[j]);
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

/** Normal quantiles for the flights' own draws, held within 3 sigma. */
const OWN_NORMAL = normalQuantileTable(3);

/** A normal draw (within 3 sigma) from one uniform u in [0, 1) through OWN_NORMAL. */
function ownNormal(u: number): number {
  const x = u * NORMAL_TABLE_CELLS;
  const i = x | 0;
  return OWN_NORMAL[i] + (x - i) * (OWN_NORMAL[i + 1] - OWN_NORMAL[i]);
}

/**
 * The flight's own draws into `out` [tropopause z (shared part mixed in), EI scatter z]: two normals
 * by the quantile table, one uniform each, each held within 3 sigma.
 */
function drawOwn(own: Uniform, s: FleetSample, group: number, out: Float64Array): void {
  const z1 = ownNormal(own());
  const z2 = ownNormal(own());
  let zTp = SHARED_A * s.groupZ[group] + OWN_B * z1;
  zTp = zTp > 3 ? 3 : zTp < -3 ? -3 : zTp;
  out[0] = zTp;
  out[1] = z2;
}

function bandValue(q: number, b: readonly [number, number, number]): number {
  return triangular(q, b[0], b[1], b[2]);
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

/** Bytes of one flight's encoded components: 18 float64 (version and scalars), then 131 float32. */
const HEAD_F64 = 18;
const HEAD_BYTES = HEAD_F64 * 8;
const CURVE_BYTES = FLEET_SHIFT_NODES * 4;
const J_BYTES = 9 * 4;
export const FLIGHT_COMPONENTS_BYTES = HEAD_BYTES + 2 * CURVE_BYTES + J_BYTES;
const FORMAT = 1;

/**
 * A flight's components as bytes (668, little-endian float64 scalars then float32 curves), to store
 * beside its figures. `decodeFlightComponents` reads them back.
 */
export function encodeFlightComponents(c: FlightComponents): Uint8Array {
  const buf = new ArrayBuffer(FLIGHT_COMPONENTS_BYTES);
  const v = new DataView(buf);
  const head = [
    FORMAT,
    c.noxTotalKg,
    ...c.jO3,
    ...c.jNo2,
    ...c.noy,
    ...c.residenceFactor,
    c.lnEiB,
    c.lnEiD,
    c.direct ? 1 : 0,
    c.sigmaShiftM,
    c.group,
  ];
  head.forEach((x, i) => v.setFloat64(i * 8, x, true));
  let o = HEAD_BYTES;
  for (const arr of [c.noxAboveKg, c.o3Kg, c.jRatio])
    for (let i = 0; i < arr.length; i++, o += 4) v.setFloat32(o, arr[i], true);
  return new Uint8Array(buf);
}

function checkEncoded(bytes: Uint8Array): DataView {
  const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (bytes.byteLength !== FLIGHT_COMPONENTS_BYTES || v.getFloat64(0, true) !== FORMAT)
    throw new RangeError('Flight components: unknown encoding');
  return v;
}

/** The components back from `encodeFlightComponents` bytes. */
export function decodeFlightComponents(bytes: Uint8Array): FlightComponents {
  const v = checkEncoded(bytes);
  const h = (i: number) => v.getFloat64(i * 8, true);
  const f32 = (at: number, n: number) => {
    const out = new Float32Array(n);
    for (let i = 0; i < n; i++) out[i] = v.getFloat32(at + i * 4, true);
    return out;
  };
  return {
    noxTotalKg: h(1),
    jO3: [h(2), h(3), h(4)],
    jNo2: [h(5), h(6), h(7)],
    noy: [h(8), h(9), h(10)],
    residenceFactor: [h(11), h(12)],
    lnEiB: h(13),
    lnEiD: h(14),
    direct: h(15) === 1,
    sigmaShiftM: h(16),
    group: h(17),
    noxAboveKg: f32(HEAD_BYTES, FLEET_SHIFT_NODES),
    o3Kg: f32(HEAD_BYTES + CURVE_BYTES, FLEET_SHIFT_NODES),
    jRatio: f32(HEAD_BYTES + 2 * CURVE_BYTES, 9),
  };
}

/** The band (J, NOx/NOy, residence) a flight reads its shared quantiles on. */
interface Band {
  jO3: [number, number, number];
  jNo2: [number, number, number];
  noy: [number, number, number];
  residenceFactor: [number, number];
}

/**
 * A fleet's components in flat typed arrays (one slot per flight), the form `sampleFleet` runs on:
 * built once from stored bytes or from component objects, with no per-flight objects left.
 */
export class FleetPack {
  n = 0;
  private cap: number;
  noxTotal: Float64Array;
  lnEiB: Float64Array;
  lnEiD: Float64Array;
  sigma: Float64Array;
  group: Int32Array;
  band: Int32Array;
  direct: Uint8Array;
  noxAbove: Float32Array;
  o3: Float32Array;
  jRatio: Float32Array;
  readonly bands: Band[] = [];
  private bandIds = new Map<string, number>();

  constructor(capacity = 1024) {
    this.cap = Math.max(1, capacity);
    this.noxTotal = new Float64Array(this.cap);
    this.lnEiB = new Float64Array(this.cap);
    this.lnEiD = new Float64Array(this.cap);
    this.sigma = new Float64Array(this.cap);
    this.group = new Int32Array(this.cap);
    this.band = new Int32Array(this.cap);
    this.direct = new Uint8Array(this.cap);
    this.noxAbove = new Float32Array(this.cap * FLEET_SHIFT_NODES);
    this.o3 = new Float32Array(this.cap * FLEET_SHIFT_NODES);
    this.jRatio = new Float32Array(this.cap * 9);
  }

  private grow(): void {
    const cap = this.cap * 2;
    const g64 = (a: Float64Array) => {
      const b = new Float64Array(cap);
      b.set(a);
      return b;
    };
    const g32 = (a: Float32Array, w: number) => {
      const b = new Float32Array(cap * w);
      b.set(a);
      return b;
    };
    const gi = (a: Int32Array) => {
      const b = new Int32Array(cap);
      b.set(a);
      return b;
    };
    this.noxTotal = g64(this.noxTotal);
    this.lnEiB = g64(this.lnEiB);
    this.lnEiD = g64(this.lnEiD);
    this.sigma = g64(this.sigma);
    this.group = gi(this.group);
    this.band = gi(this.band);
    const d = new Uint8Array(cap);
    d.set(this.direct);
    this.direct = d;
    this.noxAbove = g32(this.noxAbove, FLEET_SHIFT_NODES);
    this.o3 = g32(this.o3, FLEET_SHIFT_NODES);
    this.jRatio = g32(this.jRatio, 9);
    this.cap = cap;
  }

  private bandId(b: Band): number {
    const key = [...b.jO3, ...b.jNo2, ...b.noy, ...b.residenceFactor].join(',');
    let id = this.bandIds.get(key);
    if (id === undefined) {
      id = this.bands.length;
      this.bandIds.set(key, id);
      this.bands.push(b);
    }
    return id;
  }

  private slot(noxTotal: number, lnB: number, lnD: number, direct: boolean, sigma: number, group: number, band: Band) {
    if (this.n === this.cap) this.grow();
    const i = this.n++;
    this.noxTotal[i] = noxTotal;
    // A direct EI (or a flight with no method spread) has no method mix: ln ratio 0 on both ends.
    this.lnEiB[i] = direct || !Number.isFinite(lnB) ? 0 : lnB;
    this.lnEiD[i] = direct || !Number.isFinite(lnD) ? 0 : lnD;
    this.sigma[i] = sigma;
    this.direct[i] = direct ? 1 : 0;
    this.group[i] = group;
    this.band[i] = this.bandId(band);
    return i;
  }

  /** Adds one flight's component object. */
  add(c: FlightComponents): void {
    const i = this.slot(c.noxTotalKg, c.lnEiB, c.lnEiD, c.direct, c.sigmaShiftM, c.group, c);
    this.noxAbove.set(c.noxAboveKg, i * FLEET_SHIFT_NODES);
    this.o3.set(c.o3Kg, i * FLEET_SHIFT_NODES);
    this.jRatio.set(c.jRatio, i * 9);
  }

  /** Adds one flight from its stored bytes (`encodeFlightComponents`). */
  addEncoded(bytes: Uint8Array): void {
    const v = checkEncoded(bytes);
    const h = (k: number) => v.getFloat64(k * 8, true);
    const i = this.slot(h(1), h(13), h(14), h(15) === 1, h(16), h(17), {
      jO3: [h(2), h(3), h(4)],
      jNo2: [h(5), h(6), h(7)],
      noy: [h(8), h(9), h(10)],
      residenceFactor: [h(11), h(12)],
    });
    let at = HEAD_BYTES;
    const na = i * FLEET_SHIFT_NODES;
    for (let j = 0; j < FLEET_SHIFT_NODES; j++, at += 4) this.noxAbove[na + j] = v.getFloat32(at, true);
    for (let j = 0; j < FLEET_SHIFT_NODES; j++, at += 4) this.o3[na + j] = v.getFloat32(at, true);
    for (let j = 0; j < 9; j++, at += 4) this.jRatio[i * 9 + j] = v.getFloat32(at, true);
  }
}

/** Cell (0|1) and fraction of x on three nodes. */
function cellOf(x: number, n: readonly [number, number, number]): number {
  return x <= n[1] ? 0 : 1;
}
function fracOf(x: number, n: readonly [number, number, number]): number {
  if (x <= n[1]) return n[1] > n[0] ? (x - n[0]) / (n[1] - n[0]) : 1;
  return n[2] > n[1] ? (x - n[1]) / (n[2] - n[1]) : 0;
}

/**
 * Percentiles of a fleet's total NOx above the tropopause (kg), share above and ozone figure (kg O3)
 * from the flights' components: `samples` (default 400) from `seed` (default 1), the correlation as
 * CORRELATION states. Cost: samples x flights weighted sums over flat typed arrays. What is shared
 * (the EI method position, residence, J, NOx/NOy quantiles, the region-month tropopause draw) is
 * worked out once per sample and band; each flight keeps only its own two normal draws (its part of
 * the tropopause error and its EI scatter), which no grouping can sum away.
 */
export function sampleFleet(
  flights: readonly FlightComponents[] | FleetPack | readonly FleetPack[],
  options: { samples?: number; seed?: number } = {},
): FleetUncertainty {
  return sampleFleetParts(flights, options).total;
}

/**
 * As `sampleFleet`, and the percentiles of each pack's own total from the same joint samples (each
 * pack's marginal is sampled exactly as if alone, up to the order of the draws): the fleets of a
 * comparison and their sum in one pass.
 */
export function sampleFleetParts(
  flights: readonly FlightComponents[] | FleetPack | readonly FleetPack[],
  options: { samples?: number; seed?: number } = {},
): { total: FleetUncertainty; parts: FleetUncertainty[] } {
  let packs: readonly FleetPack[];
  if (flights instanceof FleetPack) packs = [flights];
  else if (flights.length > 0 && flights[0] instanceof FleetPack) packs = flights as readonly FleetPack[];
  else {
    const pack = new FleetPack(flights.length);
    for (const c of flights as readonly FlightComponents[]) pack.add(c);
    packs = [pack];
  }
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
  const nbMax = Math.max(1, ...packs.map((p) => p.bands.length));
  const bandScale = new Float64Array(nbMax);
  const bandA = new Int32Array(nbMax);
  const bandFa = new Float64Array(nbMax);
  const bandB = new Int32Array(nbMax);
  const bandFb = new Float64Array(nbMax);
  const groupShift = new Float64Array(GROUPS);
  const sigFuel = EI_LN_SIGMA.fuelFlowMethod;
  const sigDirect = EI_LN_SIGMA.direct;
  let flightCount = 0;
  for (const p of packs) flightCount += p.n;
  const partAbove = packs.map(() => new Float64Array(samples));
  const partTotal = packs.map(() => new Float64Array(samples));
  const partO3 = packs.map(() => new Float64Array(samples));
  for (let i = 0; i < samples; i++) {
    drawShared(shared, groups, s);
    for (let g = 0; g < GROUPS; g++) groupShift[g] = SHARED_A * s.groupZ[g];
    const u = s.u;
    let a = 0;
    let t = 0;
    let o = 0;
    for (let pi = 0; pi < packs.length; pi++) {
      const pack = packs[pi];
      const nb = pack.bands.length;
      let pa = 0;
      let pt = 0;
      let po = 0;
      for (let b = 0; b < nb; b++) {
        const c = pack.bands[b];
        const tf = Math.exp(
          triangular(s.tauFactorQ, Math.log(c.residenceFactor[0]), 0, Math.log(c.residenceFactor[1])),
        );
        const noy = c.noy[1] > 0 ? bandValue(s.noyQ, c.noy) / c.noy[1] : 1;
        bandScale[b] = tf * noy;
        const j3 = bandValue(s.jO3Q, c.jO3);
        const j2 = bandValue(s.jNo2Q, c.jNo2);
        bandA[b] = cellOf(j3, c.jO3);
        bandFa[b] = fracOf(j3, c.jO3);
        bandB[b] = cellOf(j2, c.jNo2);
        bandFb[b] = fracOf(j2, c.jNo2);
      }
      const { n, noxTotal, lnEiB, lnEiD, sigma, group, band, direct, noxAbove, o3: o3c, jRatio } = pack;
      for (let f = 0; f < n; f++) {
        // The flight's own two normals, as drawOwn (inlined: this loop runs samples x flights times).
        let x1 = own() * NORMAL_TABLE_CELLS;
        let ix = x1 | 0;
        const z1 = OWN_NORMAL[ix] + (x1 - ix) * (OWN_NORMAL[ix + 1] - OWN_NORMAL[ix]);
        x1 = own() * NORMAL_TABLE_CELLS;
        ix = x1 | 0;
        const z2 = OWN_NORMAL[ix] + (x1 - ix) * (OWN_NORMAL[ix + 1] - OWN_NORMAL[ix]);
        let zTp = groupShift[group[f]] + OWN_B * z1;
        zTp = zTp > 3 ? 3 : zTp < -3 ? -3 : zTp;
        let x = (zTp * sigma[f] - SHIFT_MIN_M) / FLEET_SHIFT_STEP_M;
        if (x < 0) x = 0;
        else if (x > last) x = last;
        let j = Math.floor(x);
        if (j > last - 1) j = last - 1;
        const fx = x - j;
        const base = f * FLEET_SHIFT_NODES + j;
        const n0 = noxAbove[base];
        const noxA = n0 + fx * (noxAbove[base + 1] - n0);
        const q0 = o3c[base];
        const o3s = q0 + fx * (o3c[base + 1] - q0);
        const lb = lnEiB[f];
        const ei = Math.exp(lb + u * (lnEiD[f] - lb) + (direct[f] === 1 ? sigDirect : sigFuel) * z2);
        pa += noxA * ei;
        pt += noxTotal[f] * ei;
        if (o3s > 0) {
          const b = band[f];
          const fa = bandFa[b];
          const fb = bandFb[b];
          const k = f * 9 + bandA[b] * 3 + bandB[b];
          const jf =
            (1 - fa) * ((1 - fb) * jRatio[k] + fb * jRatio[k + 1]) +
            fa * ((1 - fb) * jRatio[k + 3] + fb * jRatio[k + 4]);
          po += o3s * ei * bandScale[b] * jf;
        }
      }
      partAbove[pi][i] = pa;
      partTotal[pi][i] = pt;
      partO3[pi][i] = po;
      a += pa;
      t += pt;
      o += po;
    }
    above[i] = a;
    total[i] = t;
    o3[i] = o;
  }
  return {
    total: finish(samples, seed, flightCount, above, total, o3),
    parts: packs.map((p, pi) => finish(samples, seed, p.n, partAbove[pi], partTotal[pi], partO3[pi])),
  };
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

/**
 * Screens one validated flight in full and returns its totals with its encoded components (null when
 * the components cannot be built: the figures still stand and the fleet sampling builds them later).
 * What the import worker keeps of a flight.
 */
export function screenWithComponents(input: ScreeningInput): {
  totals: ScreeningTotals;
  components: Uint8Array | null;
} {
  const result = screenValidated(input);
  let components: Uint8Array | null = null;
  try {
    components = encodeFlightComponents(flightComponents(input, result));
  } catch {
    components = null;
  }
  const { engineVersion, distanceKm, fuelKg, noxTotalKg, noxAboveTropopauseKg, fractionAboveTropopause } = result;
  const { centralKg, lowKg, highKg, o3PerNox, chainLength } = result.ozoneLoss;
  return {
    totals: {
      engineVersion,
      distanceKm,
      fuelKg,
      noxTotalKg,
      noxAboveTropopauseKg,
      fractionAboveTropopause,
      meanDepthAboveTropopauseKm: result.meanDepthAboveTropopauseKm,
      ozoneLoss: { centralKg, lowKg, highKg, o3PerNox, chainLength },
    },
    components,
  };
}
