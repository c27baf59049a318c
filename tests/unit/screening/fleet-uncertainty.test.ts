import { describe, expect, it } from 'vitest';
import { mulberry32 } from '@/lib/screening/prng';
import { flightComponents, sampleFleet, sampleFleetExact } from '@/lib/screening/fleet-uncertainty';
import { screenValidated, validateScreeningInput } from '@/lib/screening';

// Invented certification-style curve (four LTO points), not a real engine.
const ENGINE = { fuelFlowKgS: [0.2, 0.6, 1.8, 2.2], eiNoxGPerKg: [5, 12, 28, 36] };

/** A synthetic fleet: mid- and high-latitude routes near the tropopause, both EI forms, all months. */
function fleet(n: number, seed: number) {
  const rnd = mulberry32(seed);
  const out = [];
  while (out.length < n) {
    const lat = (rnd() < 0.7 ? 1 : -1) * (30 + rnd() * 35);
    const lon = -170 + rnd() * 300;
    const raw = {
      route: {
        waypoints: [
          { lat, lon },
          { lat: lat + (rnd() - 0.5) * 10, lon: lon + 10 + rnd() * 40 },
        ],
      },
      cruise: { flightLevel: 300 + Math.floor(rnd() * 13) * 10 },
      fuelBurnKg: 8000 + rnd() * 40_000,
      emission: rnd() < 0.5 ? { eiNoxGPerKg: 10 + rnd() * 10 } : { engine: ENGINE, engineCount: 2 },
      month: 1 + Math.floor(rnd() * 12),
    };
    const input = validateScreeningInput(raw);
    try {
      out.push({ input, result: screenValidated(input) });
    } catch {
      // A fuel flow outside the engine's range is refused; draw another flight.
    }
  }
  return out;
}

describe('fleet percentiles', () => {
  it("from the flights' components agree with a brute-force re-evaluation of every flight (200 flights, same draws)", () => {
    const flights = fleet(200, 7);
    const comps = flights.map((f) => flightComponents(f.input, f.result));
    const fast = sampleFleet(comps, { samples: 300, seed: 4 });
    const exact = sampleFleetExact(flights, { samples: 300, seed: 4 });
    // The Monte Carlo error of the exact sums themselves, from a second seed: the components must agree
    // with the exact sums (same draws) much better than two seeds agree with each other.
    const other = sampleFleetExact(flights, { samples: 300, seed: 5 });
    for (const key of ['noxAboveTropopauseKg', 'ozoneLossKg', 'fractionAboveTropopause'] as const) {
      for (const q of ['p5', 'p50', 'p95'] as const) {
        const rel = Math.abs(fast[key][q] - exact[key][q]) / exact[key][q];
        const mc = Math.abs(other[key][q] - exact[key][q]) / exact[key][q];
        expect(rel, `${key} ${q}`).toBeLessThan(0.03);
        expect(rel, `${key} ${q} against the seed-to-seed error ${mc}`).toBeLessThan(Math.max(mc, 0.005));
      }
    }
    expect(fast.correlation).toMatch(/shared by every flight/);
  });

  it("is narrower, relative to its median, than the sum of the flights' own percentile bands would suggest", () => {
    // Independent errors (tropopause half, EI scatter) partly cancel over a fleet; shared ones do not.
    const flights = fleet(60, 9);
    const comps = flights.map((f) => flightComponents(f.input, f.result));
    const total = sampleFleet(comps, { samples: 400, seed: 2 });
    const singles = comps.map((c) => sampleFleet([c], { samples: 400, seed: 2 }));
    const sumP5 = singles.reduce((t, s) => t + s.noxAboveTropopauseKg.p5, 0);
    const sumP95 = singles.reduce((t, s) => t + s.noxAboveTropopauseKg.p95, 0);
    expect(total.noxAboveTropopauseKg.p5).toBeGreaterThan(sumP5);
    expect(total.noxAboveTropopauseKg.p95).toBeLessThan(sumP95);
  });

  it('gives the same percentiles for the same seed', () => {
    const comps = fleet(20, 3).map((f) => flightComponents(f.input, f.result));
    expect(sampleFleet(comps, { seed: 8, samples: 100 })).toStrictEqual(sampleFleet(comps, { seed: 8, samples: 100 }));
  });
});
