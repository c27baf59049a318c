/**
 * Fleet percentiles (issue 12, item 6, engine part): 400 samples of a 100 000-flight fleet from the
 * flights' components (weighted sums, no re-screening). The components of 500 distinct synthetic
 * flights are built and timed (that cost belongs to screening each flight once), then repeated to
 * 100 000 flights for the sampling time. Invented routes and an invented engine.
 *
 * Run: npx tsx tests/bench/fleet-uncertainty.ts [flights]
 */
import { mulberry32 } from '../../lib/screening/prng';
import { flightComponents, sampleFleet, type FlightComponents } from '../../lib/screening/fleet-uncertainty';
import { screenValidated, validateScreeningInput } from '../../lib/screening/index';

const FLIGHTS = Number(process.argv[2] ?? 100_000);
const DISTINCT = 500;
const ENGINE = {
  fuelFlowKgS: [0.2, 0.6, 1.8, 2.2] as [number, number, number, number],
  eiNoxGPerKg: [5, 12, 28, 36] as [number, number, number, number],
};

const rnd = mulberry32(20_261_203);
const comps: FlightComponents[] = [];
let screenMs = 0;
let compMs = 0;
while (comps.length < DISTINCT) {
  const lat = (rnd() < 0.7 ? 1 : -1) * (25 + rnd() * 45);
  const lon = -170 + rnd() * 270;
  const input = validateScreeningInput({
    route: {
      waypoints: [
        { lat, lon },
        { lat: lat + (rnd() - 0.5) * 10, lon: lon + 10 + rnd() * 60 },
      ],
    },
    cruise: { flightLevel: 300 + Math.floor(rnd() * 13) * 10 },
    fuelBurnKg: 8000 + rnd() * 60_000,
    emission: rnd() < 0.5 ? { eiNoxGPerKg: 10 + rnd() * 10 } : { engine: ENGINE, engineCount: 2 },
    month: 1 + Math.floor(rnd() * 12),
  });
  let t = performance.now();
  let result;
  try {
    result = screenValidated(input);
  } catch {
    continue;
  }
  screenMs += performance.now() - t;
  t = performance.now();
  comps.push(flightComponents(input, result));
  compMs += performance.now() - t;
}
const fleet = Array.from({ length: FLIGHTS }, (_, i) => comps[i % DISTINCT]);
sampleFleet(fleet.slice(0, 1000), { samples: 50 });
const t = performance.now();
const r = sampleFleet(fleet, { samples: 400 });
const s = (performance.now() - t) / 1000;
console.log(
  `fleet percentiles: ${FLIGHTS} flights (${DISTINCT} distinct, repeated), 400 samples: ${s.toFixed(2)} s (target under 10 s)`,
);
console.log(
  `  components per flight ${(compMs / DISTINCT).toFixed(2)} ms beside its full screening ${(screenMs / DISTINCT).toFixed(2)} ms; about ${((FLIGHTS * 61 * 2 + FLIGHTS * 9) * 4) / 1e6} MB of components`,
);
console.log(
  `  ozone figure p5 ${(r.ozoneLossKg.p5 / 1000).toFixed(0)} t, p50 ${(r.ozoneLossKg.p50 / 1000).toFixed(0)} t, p95 ${(r.ozoneLossKg.p95 / 1000).toFixed(0)} t`,
);
