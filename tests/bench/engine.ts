/**
 * Engine benchmark (issue 3): a deterministic synthetic schedule of 100 000 flights screened in one
 * process on already-validated inputs, beside a floor loop over the same segments that evaluates only
 * the irreducible math of each (one great-circle position, one ISA pressure, one tropopause height
 * from the lookup table placed in pressure in its column, one EI interpolation and correction, one
 * rate constant) with no allocation. Prints flights/s,
 * segments/s, the engine/floor ratio, the validation share and the peak RSS.
 *
 * Run: npx tsx tests/bench/engine.ts [flights]
 */
import {
  findAirport,
  screenValidated,
  validateScreeningInput,
  ENGINE_VERSION,
  type ScreeningInput,
  type ScreeningInputRaw,
} from '../../lib/screening/index';
import { EARTH_RADIUS_M, MAX_SEGMENT_KM, planRoute, resolveWaypoints } from '../../lib/screening/great-circle';
import { MID_MONTH_DAY_OF_YEAR } from '../../lib/screening/tropopause';
import { COLUMNS, bthHeightKm, bthRowForDay, columnPressurePa } from '../../lib/screening/climatology';
import { profileSlotFor } from '../../lib/screening/ozone-loss';
import { BFFM2_INSTALLATION_FACTORS, buildEiCurve, humidityTerm } from '../../lib/screening/emission-index';
import { isaTemperatureAt } from '../../lib/screening/atmosphere';
import { seededRandom } from '../../lib/random';

const FLIGHTS = Number(process.argv[2] ?? 100_000);
const SEED = 20_261_201;

const AIRPORTS = [
  'EGLL',
  'KJFK',
  'LFPG',
  'EDDF',
  'EHAM',
  'LEMD',
  'LIRF',
  'OMDB',
  'OTHH',
  'VHHH',
  'RJTT',
  'RKSI',
  'WSSS',
  'YSSY',
  'NZAA',
  'KLAX',
  'KSFO',
  'KORD',
  'KATL',
  'KDFW',
  'CYYZ',
  'CYVR',
  'SBGR',
  'SAEZ',
  'SCEL',
  'MMMX',
  'FAOR',
  'HECA',
  'DNMM',
  'VIDP',
  'VABB',
  'ZBAA',
  'ZSPD',
  'PANC',
  'BIKF',
  'ENGM',
  'EFHK',
  'LTFM',
  'OERK',
  'WMKK',
  'VTBS',
  'RPLL',
  'PHNL',
  'KSEA',
  'KMIA',
  'LPPT',
  'LSZH',
  'EKCH',
  'UUEE',
  'HKJK',
];

// Invented engines with plausible certification values (demo data, not real engines).
const ENGINES: {
  fuelFlowKgS: [number, number, number, number];
  eiNoxGPerKg: [number, number, number, number];
  count: number;
}[] = [
  { fuelFlowKgS: [0.1, 0.32, 0.98, 1.2], eiNoxGPerKg: [4.6, 10.2, 22.4, 28.1], count: 2 },
  { fuelFlowKgS: [0.19, 0.6, 1.85, 2.3], eiNoxGPerKg: [5.1, 11.8, 29.5, 38.2], count: 2 },
  { fuelFlowKgS: [0.24, 0.72, 2.2, 2.8], eiNoxGPerKg: [5.5, 12.6, 33.0, 43.5], count: 2 },
  { fuelFlowKgS: [0.12, 0.38, 1.1, 1.36], eiNoxGPerKg: [4.2, 9.6, 20.1, 25.3], count: 4 },
];

function haversineKm(a: { lat: number; lon: number }, b: { lat: number; lon: number }): number {
  const r = Math.PI / 180;
  const s =
    Math.sin(((b.lat - a.lat) * r) / 2) ** 2 +
    Math.cos(a.lat * r) * Math.cos(b.lat * r) * Math.sin(((b.lon - a.lon) * r) / 2) ** 2;
  return 2 * 6_378_137e-3 * Math.asin(Math.sqrt(s));
}

function schedule(n: number): ScreeningInputRaw[] {
  const rnd = seededRandom(SEED);
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];
  const coords = new Map(
    AIRPORTS.map((c) => {
      const a = findAirport(c);
      if (a === null) throw new Error(`bench airport ${c} missing`);
      return [c, { lat: a.lat, lon: a.lon }] as const;
    }),
  );
  const out: ScreeningInputRaw[] = [];
  while (out.length < n) {
    const supersonic = rnd() < 0.02;
    const o = pick(AIRPORTS);
    const d = pick(AIRPORTS);
    if (o === d) continue;
    const km = haversineKm(coords.get(o)!, coords.get(d)!);
    if (km < 500 || km > (supersonic ? 8000 : 12_000)) continue;
    const waypoints: Extract<ScreeningInputRaw['route'], { waypoints: unknown }>['waypoints'] = [{ airport: o }];
    if (rnd() < 0.3) {
      const a = coords.get(o)!;
      const b = coords.get(d)!;
      waypoints.push({
        lat: Math.max(-89, Math.min(89, (a.lat + b.lat) / 2 + (rnd() - 0.5) * 4)),
        lon:
          Math.abs(a.lon - b.lon) < 180
            ? (a.lon + b.lon) / 2 + (rnd() - 0.5) * 4
            : (((a.lon + b.lon) / 2 + 180) % 360) - 180,
      });
    }
    waypoints.push({ airport: d });
    const base = supersonic ? 550 + 10 * Math.floor(rnd() * 4) : 300 + 10 * Math.floor(rnd() * 9);
    let cruise: ScreeningInputRaw['cruise'];
    if (rnd() < 0.5) cruise = { flightLevel: base };
    else {
      const nSteps = 2 + Math.floor(rnd() * 3);
      const steps = [{ fromKm: 0, flightLevel: base }];
      for (let s = 1; s < nSteps; s++) {
        steps.push({ fromKm: Math.round((km * s) / (nSteps + 0.5)), flightLevel: Math.min(660, base + 20 * s) });
      }
      cruise = { steps };
    }
    const fuelBurnKg = Math.min(450_000, Math.round(km * (supersonic ? 12 + rnd() * 6 : 2.5 + rnd() * 6.5)));
    const mach = supersonic ? 1.7 + rnd() * 0.3 : 0.76 + rnd() * 0.1;
    let emission: ScreeningInputRaw['emission'];
    if (supersonic || rnd() < 0.25) emission = { eiNoxGPerKg: supersonic ? 5 + rnd() * 7 : 8 + rnd() * 12 };
    else {
      const e = pick(ENGINES);
      emission = {
        engine: { fuelFlowKgS: e.fuelFlowKgS, eiNoxGPerKg: e.eiNoxGPerKg },
        engineCount: e.count,
        ...(rnd() < 0.15 ? { method: 'dlr' as const } : {}),
      };
    }
    const flight: ScreeningInputRaw = { route: { waypoints }, cruise, mach, fuelBurnKg, emission };
    const u = rnd();
    if (u < 0.6) flight.month = 1 + Math.floor(rnd() * 12);
    else if (u < 0.9) {
      const m = 1 + Math.floor(rnd() * 12);
      flight.flightDate = `2026-${String(m).padStart(2, '0')}-${String(1 + Math.floor(rnd() * 28)).padStart(2, '0')}`;
    }
    if (rnd() < 0.01) flight.tropopause = { pressureHpa: 180 + rnd() * 120 };
    out.push(flight);
  }
  return out;
}

/**
 * Per-flight data the floor loop reads, packed into one Float64Array outside the timed loop:
 * [legs, steps, fuelFlowPerEngineKgS, mach, humidityFactor, month (0 for none), unused,
 *  per leg: legKm, legStartKm, sinLat1, cosLat1, lon1, sinBearing, cosBearing,
 *  per step: fromKm, altitudeM, curve: lnWf x4, lnEi x4, slope x3].
 */
interface FloorData {
  pool: Float64Array;
  offset: Int32Array;
  /** Per flight, the tropopause table row for its day (shared for the same day). */
  rows: Float64Array[];
}

const HEADER = 7;
const PER_LEG = 7;
const PER_STEP = 2;

function prepareFloor(inputs: readonly ScreeningInput[]): FloorData {
  const DEG = Math.PI / 180;
  const chunks: number[][] = [];
  const rows: Float64Array[] = [];
  let size = 0;
  for (const f of inputs) {
    const { lat, lon } = resolveWaypoints('waypoints' in f.route ? f.route.waypoints : []);
    const plan = planRoute(lat, lon);
    const legs = plan.legKm.length;
    const steps =
      'steps' in f.cruise
        ? f.cruise.steps.filter((s, i) => i === 0 || s.fromKm < plan.totalKm)
        : [{ fromKm: 0, flightLevel: f.cruise.flightLevel }];
    const engine =
      'engine' in f.emission
        ? f.emission.engine
        : { fuelFlowKgS: [0.1, 0.3, 1, 1.2] as const, eiNoxGPerKg: [5, 10, 20, 25] as const };
    const curve = buildEiCurve(engine, BFFM2_INSTALLATION_FACTORS);
    const mach = f.mach ?? 0.8;
    const hours = plan.totalKm / (mach * 295 * 3.6);
    const engines = 'engineCount' in f.emission ? f.emission.engineCount : 2;
    const doy =
      f.month !== undefined
        ? MID_MONTH_DAY_OF_YEAR[f.month - 1]
        : f.flightDate !== undefined
          ? (Date.UTC(
              Number(f.flightDate.slice(0, 4)),
              Number(f.flightDate.slice(5, 7)) - 1,
              Number(f.flightDate.slice(8, 10)),
            ) -
              Date.UTC(Number(f.flightDate.slice(0, 4)), 0, 1)) /
              86_400_000 +
            1
          : null;
    const month = f.month ?? (f.flightDate !== undefined ? Number(f.flightDate.slice(5, 7)) : 0);
    rows.push(bthRowForDay(doy));
    const alt0 = steps[0].flightLevel * 30.48;
    const c: number[] = [
      legs,
      steps.length,
      f.fuelBurnKg / (hours * 3600) / engines,
      mach,
      Math.exp(humidityTerm(0.6, 23_000, isaTemperatureAt(alt0))),
      month,
      0,
    ];
    for (let i = 0; i < legs; i++) {
      const p1 = lat[i] * DEG;
      const p2 = lat[i + 1] * DEG;
      const dl = (lon[i + 1] - lon[i]) * DEG;
      const brg = Math.atan2(
        Math.sin(dl) * Math.cos(p2),
        Math.cos(p1) * Math.sin(p2) - Math.sin(p1) * Math.cos(p2) * Math.cos(dl),
      );
      c.push(plan.legKm[i], plan.legStartKm[i], Math.sin(p1), Math.cos(p1), lon[i] * DEG, Math.sin(brg), Math.cos(brg));
    }
    for (const s of steps) c.push(s.fromKm, s.flightLevel * 30.48);
    const lnWf = [...curve.lnFuelFlow];
    const lnEi = [...curve.lnEi];
    const slope = [...curve.slope];
    while (lnWf.length < 4) {
      lnWf.push(Number.POSITIVE_INFINITY);
      lnEi.push(0);
    }
    while (slope.length < 3) slope.push(0);
    c.push(...lnWf, ...lnEi, ...slope);
    chunks.push(c);
    size += c.length;
  }
  const pool = new Float64Array(size);
  const offset = new Int32Array(chunks.length + 1);
  let o = 0;
  chunks.forEach((c, i) => {
    offset[i] = o;
    pool.set(c, o);
    o += c.length;
  });
  offset[chunks.length] = o;
  return { pool, offset, rows };
}

/** The floor: same segment boundaries as the engine, only the irreducible math, no allocation. */
function floorLoop(data: FloorData): { checksum: number; segments: number } {
  const R = EARTH_RADIUS_M;
  const RAD = 180 / Math.PI;
  const P = data.pool;
  let checksum = 0;
  let segments = 0;
  for (let f = 0; f + 1 < data.offset.length; f++) {
    const o = data.offset[f];
    const legs = P[o];
    const nSteps = P[o + 1];
    const wfPerEngine = P[o + 2];
    const mach = P[o + 3];
    const humidityFactor = P[o + 4];
    const month = P[o + 5] > 0 ? P[o + 5] : null;
    const row = data.rows[f];
    const so = o + HEADER + legs * PER_LEG;
    const co = so + nSteps * PER_STEP;
    let step = 0;
    let nextStepKm = nSteps > 1 ? P[so + PER_STEP] : Number.POSITIVE_INFINITY;
    const machTerm = Math.exp(0.2 * mach * mach);
    for (let leg = 0; leg < legs; leg++) {
      const lo = o + HEADER + leg * PER_LEG;
      const legKm = P[lo];
      if (legKm === 0) continue;
      const legStart = P[lo + 1];
      const sinLat1 = P[lo + 2];
      const cosLat1 = P[lo + 3];
      const lon1 = P[lo + 4];
      const sinBrg = P[lo + 5];
      const cosBrg = P[lo + 6];
      const n = Math.ceil(legKm / MAX_SEGMENT_KM);
      const piece = legKm / n;
      for (let j = 0; j < n; j++) {
        const b = j === n - 1 ? legStart + legKm : legStart + (j + 1) * piece;
        let a = legStart + j * piece;
        while (a < b) {
          const e = nextStepKm < b ? nextStepKm : b;
          if (e > a) {
            segments++;
            // One great-circle position (destination-point formula).
            const delta = ((0.5 * (a + e) - legStart) * 1000) / R;
            const sd = Math.sin(delta);
            const cd = Math.cos(delta);
            const sinLat = sinLat1 * cd + cosLat1 * sd * cosBrg;
            const lat = Math.asin(sinLat) * RAD;
            const lon = lon1 + Math.atan2(sinBrg * sd * cosLat1, cd - sinLat1 * sinLat);
            // One ISA pressure and temperature.
            const h = P[so + step * PER_STEP + 1];
            let p: number;
            let t: number;
            if (h < 11_000) {
              t = 288.15 - 0.0065 * h;
              p = 101_325 * Math.pow(288.15 / t, -5.255877);
            } else {
              t = 216.65;
              p = 22_632.06 * Math.exp((-9.80665 * (h - 11_000)) / (287.05287 * 216.65));
            }
            // One tropopause (Mateus et al. 2022 lookup table) placed in pressure in its AFGL column.
            const tpPa = columnPressurePa(COLUMNS[profileSlotFor(lat, month)], bthHeightKm(row, lat));
            // One EI interpolation and BFFM2 correction.
            const delta0 = p / 101_325;
            const theta = t / 288.15;
            const wff = (wfPerEngine / delta0) * Math.pow(theta, 3.8) * machTerm;
            const x = Math.log(wff);
            let k = 0;
            while (k < 2 && x > P[co + k + 1]) k++;
            const ei =
              Math.exp(P[co + 4 + k] + P[co + 8 + k] * (x - P[co + k])) *
              humidityFactor *
              Math.sqrt(Math.pow(delta0, 1.02) / Math.pow(theta, 3.3));
            // One rate constant, k(NO2 + O): its high-pressure Arrhenius part per segment (the
            // fall-off share depends on the level only, as the engine caches it per level).
            const kr = 5.3e-12 * Math.exp(200 / t);
            checksum += lon * 1e-9 + (p < tpPa ? ei : 0) + kr * 1e10;
          }
          a = e;
          if (a === nextStepKm) {
            step++;
            nextStepKm = step + 1 < nSteps ? P[so + (step + 1) * PER_STEP] : Number.POSITIVE_INFINITY;
          }
        }
      }
    }
  }
  return { checksum, segments };
}

let peakRss = 0;
function sampleRss(): number {
  const r = process.memoryUsage().rss;
  if (r > peakRss) peakRss = r;
  return r;
}

function main(): void {
  const t0 = performance.now();
  const raw = schedule(FLIGHTS);
  const tGen = performance.now() - t0;
  sampleRss();

  // Warm-up on a slice (JIT), not timed.
  const warm = raw.slice(0, Math.min(2000, raw.length)).map((r) => validateScreeningInput(r));
  for (const w of warm) screenValidated(w);
  floorLoop(prepareFloor(warm));

  // Validation as a handler or an import does it: each raw input once, the result used and dropped.
  let checkedWaypoints = 0;
  const tv0 = performance.now();
  for (let i = 0; i < raw.length; i++) {
    const route = validateScreeningInput(raw[i]).route;
    checkedWaypoints += 'waypoints' in route ? route.waypoints.length : 0;
  }
  const tValidate = performance.now() - tv0;
  sampleRss();

  // The engine runs on inputs validated beforehand; keeping all 100 000 alive costs extra GC, shown apart.
  const tk0 = performance.now();
  const inputs: ScreeningInput[] = raw.map((r) => validateScreeningInput(r));
  const tValidateKept = performance.now() - tk0;
  const rssBeforeEngine = sampleRss();
  let peakEngineRss = rssBeforeEngine;
  let segments = 0;
  let noxAbove = 0;
  let ozone = 0;
  const te0 = performance.now();
  for (let i = 0; i < inputs.length; i++) {
    const r = screenValidated(inputs[i]);
    segments += r.segments.length;
    noxAbove += r.noxAboveTropopauseKg;
    ozone += r.ozoneLoss.centralKg;
    if ((i & 1023) === 0) {
      const rss = process.memoryUsage().rss;
      if (rss > peakEngineRss) peakEngineRss = rss;
    }
  }
  const tEngine = performance.now() - te0;
  if (peakEngineRss > peakRss) peakRss = peakEngineRss;

  const prepared = prepareFloor(inputs);
  const tf0 = performance.now();
  const floor = floorLoop(prepared);
  const tFloor = performance.now() - tf0;
  sampleRss();

  const sec = (ms: number) => (ms / 1000).toFixed(3);
  const mb = (b: number) => (b / 1024 / 1024).toFixed(0);
  const lines = [
    `Tropopass engine benchmark (engine ${ENGINE_VERSION}, Node ${process.version}, seed ${SEED}, one thread)`,
    `flights                    ${inputs.length}`,
    `segments (engine / floor)  ${segments} / ${floor.segments}`,
    `schedule generation        ${sec(tGen)} s (not timed below)`,
    `validation                 ${sec(tValidate)} s  (${((inputs.length / tValidate) * 1000).toFixed(0)} inputs/s, ${checkedWaypoints} waypoints)`,
    `engine                     ${sec(tEngine)} s`,
    `engine flights/s           ${((inputs.length / tEngine) * 1000).toFixed(0)}`,
    `engine segments/s          ${((segments / tEngine) * 1000).toFixed(0)}`,
    `floor                      ${sec(tFloor)} s  (${((floor.segments / tFloor) * 1000).toFixed(0)} segments/s)`,
    `ratio engine/floor         ${(tEngine / tFloor).toFixed(2)}`,
    `validation / engine time   ${((100 * tValidate) / tEngine).toFixed(1)} % (each result used and dropped); ${((100 * tValidateKept) / tEngine).toFixed(1)} % when all ${inputs.length} results are kept in memory`,
    `peak RSS                   ${mb(peakRss)} MB (whole run); engine pass ${mb(rssBeforeEngine)} -> ${mb(peakEngineRss)} MB`,
    `checks                     NOx above tropopause ${(noxAbove / 1e6).toFixed(2)} kt, O3 central ${(ozone / 1e6).toFixed(2)} kt, floor checksum ${floor.checksum.toExponential(4)}`,
  ];
  console.log(lines.join('\n'));
}

main();
