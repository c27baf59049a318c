import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  ScreeningInputError,
  compareCruiseLevels,
  compareValidated,
  screenFlight,
  validateScreeningInput,
} from '@/lib/screening';

const flight = (cruise: unknown = { flightLevel: 350 }) => ({
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise,
  fuelBurnKg: 30_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
});

describe('compareCruiseLevels', () => {
  it('defaults: -4000..+4000 ft in 2000 ft steps, 1 %/1000 ft penalty (rule of thumb, common practice), 2 % limit', () => {
    const rows = compareCruiseLevels(flight());
    expect(rows.map((r) => r.flightLevel)).toEqual([310, 330, 350, 370, 390]);
    expect(rows.map((r) => r.fuelPenaltyPct)).toEqual([4, 2, 0, 2, 4]);
    expect(rows.map((r) => r.withinLimit)).toEqual([false, true, true, true, false]);
    for (const r of rows) expect(r.fuelKg).toBeCloseTo(30_000 * (1 + r.fuelPenaltyPct / 100), 9);
  });

  it('adds the penalty fuel before NOx: NOx = penalised fuel x EI', () => {
    for (const r of compareCruiseLevels(flight())) expect(r.noxTotalKg).toBeCloseTo((r.fuelKg * 14) / 1000, 6);
  });

  it('the planned row equals screenFlight of the planned flight', () => {
    const planned = compareCruiseLevels(flight()).find((r) => r.deltaFt === 0)!;
    const r = screenFlight(flight());
    expect(planned.noxAboveTropopauseKg).toBe(r.noxAboveTropopauseKg);
    expect(planned.ozoneLoss.centralKg).toBe(r.ozoneLoss.centralKg);
  });

  it('given the planned screening, uses it for the unshifted row and gives the same rows as without it', () => {
    const input = validateScreeningInput(
      flight({
        steps: [
          { fromKm: 0, flightLevel: 340 },
          { fromKm: 2500, flightLevel: 380 },
        ],
      }),
    );
    const planned = screenFlight(
      flight({
        steps: [
          { fromKm: 0, flightLevel: 340 },
          { fromKm: 2500, flightLevel: 380 },
        ],
      }),
    );
    const alone = compareValidated(input, {});
    expect(compareValidated(input, {}, planned)).toEqual(alone);
    // The planned screening really is what the unshifted row reads: a different one shows through.
    const other = { ...planned, noxAboveTropopauseKg: planned.noxAboveTropopauseKg + 1 };
    const rows = compareValidated(input, {}, other);
    expect(rows.find((r) => r.deltaFt === 0)!.noxAboveTropopauseKg).toBe(planned.noxAboveTropopauseKg + 1);
    expect(rows.find((r) => r.deltaFt === 2000)!.noxAboveTropopauseKg).toBe(
      alone.find((r) => r.deltaFt === 2000)!.noxAboveTropopauseKg,
    );
  });

  it('marks exactly one lowest-impact row, within the limit, with the least central ozone figure', () => {
    const rows = compareCruiseLevels(flight());
    const marked = rows.filter((r) => r.lowestImpact);
    expect(marked).toHaveLength(1);
    expect(marked[0].withinLimit).toBe(true);
    for (const r of rows.filter((x) => x.withinLimit))
      expect(marked[0].ozoneLoss.centralKg).toBeLessThanOrEqual(r.ozoneLoss.centralKg);
  });

  it('the planner chooses what the mark minimises, and the mark is named after it', () => {
    const byNox = compareCruiseLevels(flight(), { minimise: 'nox-above-tropopause' });
    const m = byNox.filter((r) => r.lowestImpact);
    expect(m).toHaveLength(1);
    for (const r of byNox.filter((x) => x.withinLimit))
      expect(m[0].noxAboveTropopauseKg).toBeLessThanOrEqual(r.noxAboveTropopauseKg);
    expect(
      byNox.every((r) => r.minimise === 'nox-above-tropopause' && r.markName === 'Least NOx above the tropopause'),
    ).toBe(true);
    const byOzone = compareCruiseLevels(flight());
    expect(byOzone.every((r) => r.minimise === 'ozone-figure' && r.markName === 'Least ozone figure')).toBe(true);
    expect(() => compareCruiseLevels(flight(), { minimise: 'co2' as never })).toThrow(ScreeningInputError);
  });

  it('shows the fuel and CO2 change beside each level (CO2 = 3.16 x fuel, ICAO CORSIA): zero at the planned level, more fuel away from it', () => {
    for (const r of compareCruiseLevels(flight())) {
      expect(r.fuelChangeKg).toBeCloseTo(r.fuelKg - 30_000, 9);
      expect(r.co2ChangeKg).toBeCloseTo(3.16 * r.fuelChangeKg, 9);
      expect(r.fuelChangeKg > 0).toBe(r.deltaFt !== 0);
    }
  });

  it('stays within FL0-FL660: shifts that leave it are dropped', () => {
    expect(compareCruiseLevels(flight({ flightLevel: 650 })).map((r) => r.flightLevel)).toEqual([610, 630, 650]);
    expect(compareCruiseLevels(flight({ flightLevel: 10 })).map((r) => r.flightLevel)).toEqual([10, 30, 50]);
  });

  it('shifts every step of a step climb together', () => {
    const rows = compareCruiseLevels(
      flight({
        steps: [
          { fromKm: 0, flightLevel: 340 },
          { fromKm: 3000, flightLevel: 380 },
        ],
      }),
    );
    expect(rows.find((r) => r.deltaFt === 2000)!.flightLevels).toEqual([360, 400]);
  });

  it('takes the options: deltas, penalty and limit', () => {
    const rows = compareCruiseLevels(flight(), {
      deltasFt: [0, 4000],
      fuelPenaltyPctPer1000Ft: 0.5,
      maxFuelPenaltyPct: 2,
    });
    expect(rows.map((r) => [r.deltaFt, r.fuelPenaltyPct, r.withinLimit])).toEqual([
      [0, 0, true],
      [4000, 2, true],
    ]);
  });

  it('reports bad options under options.*', () => {
    const paths = (o: Record<string, unknown>) => {
      try {
        compareCruiseLevels(flight(), o as never);
      } catch (e) {
        expect(e).toBeInstanceOf(ScreeningInputError);
        return (e as ScreeningInputError).fields.map((f) => f.path);
      }
      return [];
    };
    expect(paths({ deltasFt: [150] })).toEqual(['options.deltasFt.0']);
    expect(paths({ fuelPenaltyPctPer1000Ft: -1 })).toEqual(['options.fuelPenaltyPctPer1000Ft']);
    expect(paths({ maxFuelPenaltyPct: 'a' })).toEqual(['options.maxFuelPenaltyPct']);
  });

  it('marks exactly one lowest-impact row within the limit for random flights (property)', () => {
    fc.assert(
      fc.property(
        fc.record({
          lat1: fc.double({ min: -70, max: 70, noNaN: true }),
          lon1: fc.double({ min: -170, max: 170, noNaN: true }),
          dLat: fc.double({ min: 3, max: 20, noNaN: true }),
          fl: fc.integer({ min: 250, max: 600 }),
          ei: fc.double({ min: 1, max: 40, noNaN: true }),
          limit: fc.double({ min: 0, max: 5, noNaN: true }),
        }),
        ({ lat1, lon1, dLat, fl, ei, limit }) => {
          const rows = compareCruiseLevels(
            {
              route: {
                waypoints: [
                  { lat: lat1, lon: lon1 },
                  { lat: lat1 + dLat, lon: lon1 + 5 },
                ],
              },
              cruise: { flightLevel: fl },
              fuelBurnKg: 5000,
              emission: { eiNoxGPerKg: ei },
            },
            { maxFuelPenaltyPct: limit },
          );
          const marked = rows.filter((r) => r.lowestImpact);
          expect(marked).toHaveLength(1);
          expect(marked[0].withinLimit).toBe(true);
          for (const r of rows) {
            if (r.withinLimit) expect(marked[0].ozoneLoss.centralKg).toBeLessThanOrEqual(r.ozoneLoss.centralKg);
          }
        },
      ),
      { numRuns: 60 },
    );
  });
});
