/**
 * Preview with sampling (issue 12): the work `POST .../screenings/preview` does for one client with
 * `uncertainty: { samples: 400 }` and `months: true` (validation, screening, 400 samples and the
 * one-at-a-time driver runs, the what-if levels, the month sweep), timed in process one request after
 * another. The HTTP and database part of a preview is measured by `npm run bench:load`; add it to these.
 *
 * Run: npx tsx tests/bench/uncertainty.ts [requests]
 */
import {
  compareValidated,
  screenValidated,
  sweepMonthsValidated,
  validateCompareOptions,
  validateScreeningInput,
  type ScreeningInputRaw,
} from '../../lib/screening/index';

const REQUESTS = Number(process.argv[2] ?? 300);

// Invented certification-style curve, not a real engine.
const ENGINE = {
  fuelFlowKgS: [0.19, 0.6, 1.85, 2.3] as [number, number, number, number],
  eiNoxGPerKg: [5.1, 11.8, 29.5, 38.2] as [number, number, number, number],
};

const FLIGHTS: ScreeningInputRaw[] = [
  {
    route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
    cruise: { flightLevel: 370 },
    fuelBurnKg: 52_000,
    emission: { engine: ENGINE, engineCount: 2 },
    month: 1,
  },
  {
    route: { waypoints: [{ airport: 'EFHK' }, { airport: 'RJTT' }] },
    cruise: {
      steps: [
        { fromKm: 0, flightLevel: 350 },
        { fromKm: 3000, flightLevel: 390 },
      ],
    },
    fuelBurnKg: 70_000,
    emission: { engine: ENGINE, engineCount: 2 },
    flightDate: '2026-07-14',
  },
  {
    route: { waypoints: [{ airport: 'YSSY' }, { airport: 'SCEL' }] },
    cruise: { flightLevel: 410 },
    fuelBurnKg: 90_000,
    emission: { eiNoxGPerKg: 15 },
  },
];

function previewWork(raw: ScreeningInputRaw): void {
  const input = validateScreeningInput({ ...raw, uncertainty: { samples: 400 } });
  const result = screenValidated(input);
  compareValidated(input, validateCompareOptions({}), result);
  sweepMonthsValidated(input);
}

const pct = (xs: number[], q: number) =>
  xs.slice().sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(q * xs.length))];

for (let i = 0; i < 20; i++) previewWork(FLIGHTS[i % FLIGHTS.length]);
const times: number[] = [];
for (let i = 0; i < REQUESTS; i++) {
  const t = performance.now();
  previewWork(FLIGHTS[i % FLIGHTS.length]);
  times.push(performance.now() - t);
}
console.log(`preview work with 400 samples, drivers and the month sweep, ${REQUESTS} requests one after another:`);
console.log(
  `  p50 ${pct(times, 0.5).toFixed(1)} ms, p95 ${pct(times, 0.95).toFixed(1)} ms, max ${Math.max(...times).toFixed(1)} ms (target: p95 under 150 ms with the HTTP part)`,
);
