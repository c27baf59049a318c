/**
 * Track screening benchmark (issue 13): a 20 000-point flown track (EFHK to PANC on the great circle,
 * climb to FL370, a step to FL390, descent, a time on every point) screened repeatedly on a validated
 * input, full result and totals only. Prints ms per screening (p50, p95). Figures only.
 *
 * Run: npx tsx tests/bench/track.ts [runs]
 */
import {
  findAirport,
  screenFlight,
  screenTotals,
  screenValidated,
  validateScreeningInput,
} from '../../lib/screening/index';
import { planRoute, pointOnLeg } from '../../lib/screening/great-circle';

const RUNS = Number(process.argv[2] ?? 30);
const N = 20_000;

const a = findAirport('EFHK')!;
const b = findAirport('PANC')!;
const plan = planRoute(Float64Array.of(a.lat, b.lat), Float64Array.of(a.lon, b.lon));
const out = [0, 0];
const t0 = Date.parse('2026-11-20T10:00:00Z');
const points = Array.from({ length: N }, (_, i) => {
  const f = i / (N - 1);
  const km = plan.totalKm * f;
  pointOnLeg(plan, 0, km, out);
  const fl = f < 0.05 ? 370 * (f / 0.05) : f > 0.95 ? 390 * ((1 - f) / 0.05) : f < 0.5 ? 370 : 390;
  return {
    lat: out[0],
    lon: out[1],
    flightLevel: Math.max(0, fl),
    time: new Date(t0 + (km / 0.245) * 1000).toISOString(),
  };
});
const input = validateScreeningInput({
  route: { track: { points } },
  fuelBurnKg: 52_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
});

const time = (fn: () => unknown): number[] => {
  const ts: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const s = performance.now();
    fn();
    ts.push(performance.now() - s);
  }
  return ts.sort((x, y) => x - y);
};
const tv = performance.now();
validateScreeningInput({ route: { track: { points } }, fuelBurnKg: 52_000, emission: { eiNoxGPerKg: 14 }, month: 1 });
const validateMs = performance.now() - tv;
const full = time(() => screenValidated(input));
const totals = time(() => screenTotals(input));
const raw = { route: { track: { points } }, fuelBurnKg: 52_000, emission: { eiNoxGPerKg: 14 }, month: 1 };
const fromRaw = time(() => screenFlight(raw));
const flowInput = validateScreeningInput({
  route: { track: { points: points.map((p) => ({ ...p, fuelFlowKgH: 7200 })) } },
  emission: { eiNoxGPerKg: 14 },
  month: 1,
});
const flows = time(() => screenValidated(flowInput));
const r = screenValidated(input);
const q = (ts: number[], p: number) => ts[Math.min(ts.length - 1, Math.floor(ts.length * p))].toFixed(1);
console.log(
  `track: ${N} points, ${r.distanceKm.toFixed(0)} km, ${r.segments.length} segments, ${r.levels.length} levels; ` +
    `full result p50 ${q(full, 0.5)} ms, p95 ${q(full, 0.95)} ms; totals only p50 ${q(totals, 0.5)} ms, p95 ${q(totals, 0.95)} ms; validation ${validateMs.toFixed(1)} ms (first run); raw input to full result (validation included) p50 ${q(fromRaw, 0.5)} ms; per-point fuel flow, full result p50 ${q(flows, 0.5)} ms (target < 50 ms screening)`,
);
