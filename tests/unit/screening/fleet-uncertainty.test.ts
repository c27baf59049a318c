import { describe, expect, it } from 'vitest';
import { inverseNormal, mulberry32, normalQuantileTable } from '@/lib/screening/prng';
import {
  FLIGHT_COMPONENTS_BYTES,
  FleetPack,
  decodeFlightComponents,
  encodeFlightComponents,
  flightComponents,
  sampleFleet,
  sampleFleetExact,
  sampleFleetParts,
  screenWithComponents,
} from '@/lib/screening/fleet-uncertainty';
import { screenTotals, screenValidated, validateScreeningInput } from '@/lib/screening';

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

describe('stored components', () => {
  it('encode to a fixed number of bytes and decode to the same components (curves as float32)', () => {
    const [f] = fleet(1, 11);
    const c = flightComponents(f.input, f.result);
    const bytes = encodeFlightComponents(c);
    expect(bytes.byteLength).toBe(FLIGHT_COMPONENTS_BYTES);
    expect(decodeFlightComponents(bytes)).toStrictEqual(c);
    // Bytes that are not components are refused, never read as figures.
    expect(() => decodeFlightComponents(new Uint8Array(10))).toThrow(RangeError);
  });

  it('a pack built from stored bytes samples exactly as the component objects do', () => {
    const comps = fleet(30, 12).map((f) => flightComponents(f.input, f.result));
    const pack = new FleetPack(4);
    for (const c of comps) pack.addEncoded(encodeFlightComponents(c));
    expect(pack.n).toBe(30);
    expect(sampleFleet(pack, { samples: 200, seed: 3 })).toStrictEqual(sampleFleet(comps, { samples: 200, seed: 3 }));
  });

  it('the totals the import keeps with the components equal the totals-only screening', () => {
    const [f] = fleet(1, 13);
    const { totals, components } = screenWithComponents(f.input);
    expect(totals).toStrictEqual(screenTotals(f.input));
    expect(components).not.toBeNull();
  });

  it('parts of one joint sampling: a pack alone gives its own band, and the parts add up to the total', () => {
    const flights = fleet(40, 14).map((f) => flightComponents(f.input, f.result));
    const a = new FleetPack();
    const b = new FleetPack();
    flights.forEach((c, i) => (i < 25 ? a : b).add(c));
    const { total, parts } = sampleFleetParts([a, b], { samples: 300, seed: 6 });
    expect(parts.map((p) => p.flights)).toEqual([25, 15]);
    expect(total.flights).toBe(40);
    // A part is its pack's own sampling up to the order of the flights' own draws: the shared draws are
    // the same, so its percentiles agree with the pack sampled alone within what 15 flights' own
    // (tropopause and EI scatter) draws move them.
    const alone = sampleFleet(b, { samples: 300, seed: 6 });
    for (const q of ['p5', 'p50', 'p95'] as const)
      expect(Math.abs(parts[1].ozoneLossKg[q] / alone.ozoneLossKg[q] - 1), q).toBeLessThan(0.1);
    // Percentiles of a sum lie between the sum of the parts' p5 and the sum of their p95.
    expect(total.noxAboveTropopauseKg.p50).toBeGreaterThan(
      parts[0].noxAboveTropopauseKg.p5 + parts[1].noxAboveTropopauseKg.p5,
    );
    expect(total.noxAboveTropopauseKg.p50).toBeLessThan(
      parts[0].noxAboveTropopauseKg.p95 + parts[1].noxAboveTropopauseKg.p95,
    );
  });
});

describe("normal quantiles for the flights' own draws", () => {
  it.each([
    // Standard normal table values (common practice, any statistics handbook).
    [0.5, 0],
    [0.8413447, 1],
    [0.95, 1.6448536],
    [0.975, 1.959964],
    [0.025, -1.959964],
    [0.001, -3.0902323],
  ])('inverseNormal(%s) = %s', (p, z) => {
    expect(inverseNormal(p)).toBeCloseTo(z, 5);
  });

  it('the table is held within 3 sigma and follows the quantile function between its nodes', () => {
    const t = normalQuantileTable(3);
    expect(Math.max(...t)).toBe(3);
    expect(Math.min(...t)).toBe(-3);
    const cells = t.length - 1;
    for (const p of [0.1, 0.3, 0.6, 0.9]) {
      const x = p * cells;
      const i = Math.floor(x);
      expect(t[i] + (x - i) * (t[i + 1] - t[i])).toBeCloseTo(inverseNormal(p), 4);
    }
  });
});
