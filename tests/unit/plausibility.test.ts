import { describe, expect, it } from 'vitest';
import { checkFuelPlausibility, fuelBandKgPerKm } from '@/lib/validation/plausibility';

// The demo long-range twin's invented engine (seeds/02_demo_engines.ts): fuel flows in kg/s per engine.
const twin = { fuelFlowKgS: [0.29, 0.93, 2.78, 3.42], engineCount: 2 };

describe('fuel against distance', () => {
  it('the reported case, 73 t over 60 km, is impossible with and without an engine', () => {
    expect(checkFuelPlausibility({ distanceKm: 60, fuelKg: 73_000 })).toMatchObject({ level: 'impossible' });
    const r = checkFuelPlausibility({
      distanceKm: 60,
      fuelKg: 73_000,
      engine: twin,
      mach: 0.85,
      aircraftCode: 'SK-LR1',
    });
    expect(r.level).toBe('impossible');
    if (r.level !== 'ok') expect(r.message).toContain('1,217 kg per km');
  });

  // Cruise burns of today's jets, common practice: a long-range twin about 6 kg/km, a business jet about 2 kg/km.
  it.each([
    [9600, 60_000, null, 'ok'],
    [9600, 60_000, twin, 'ok'],
    [5500, 10_500, null, 'ok'],
    [1000, 25_000, null, 'unusual'],
    [1000, 25_000, twin, 'unusual'],
    [1000, 300, null, 'unusual'],
    [1000, 50, null, 'impossible'],
    [1000, 2_000, twin, 'unusual'],
    [1000, 500, twin, 'impossible'],
  ] as const)('%d km with %d kg (engine %j): %s', (distanceKm, fuelKg, engine, level) => {
    expect(checkFuelPlausibility({ distanceKm, fuelKg, engine, mach: 0.85 }).level).toBe(level);
  });

  it('the band follows the engine: a business-jet engine makes 12 kg/km impossible that a long-range twin may burn', () => {
    const bizjet = { fuelFlowKgS: [0.062, 0.185, 0.55, 0.68], engineCount: 2 };
    expect(checkFuelPlausibility({ distanceKm: 1000, fuelKg: 12_000, engine: bizjet, mach: 0.85 }).level).toBe(
      'impossible',
    );
    expect(checkFuelPlausibility({ distanceKm: 1000, fuelKg: 12_000, engine: twin, mach: 0.85 }).level).toBe('ok');
    const band = fuelBandKgPerKm({ engine: bizjet, mach: 0.85 });
    expect(band.unusualBelow).toBeLessThan(1.8);
    expect(band.unusualAbove).toBeGreaterThan(2.1);
  });

  it('an unknown distance is not judged', () => {
    expect(checkFuelPlausibility({ distanceKm: 0, fuelKg: 1000 }).level).toBe('ok');
  });
});
