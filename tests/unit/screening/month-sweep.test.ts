import { describe, expect, it } from 'vitest';
import { SAME_EVERY_MONTH_NOTE, ScreeningInputError, screenAcrossMonths, screenFlight } from '@/lib/screening';

// A zonal route along 45 degrees at FL350 (10 668 m pressure altitude): close to the mid-latitude
// tropopause, which sits lower in local winter than in local summer.
const along45 = (lat: number, lon0: number) => ({
  route: {
    waypoints: [
      { lat, lon: lon0 },
      { lat, lon: lon0 + 30 },
    ],
  },
  cruise: { flightLevel: 350 },
  fuelBurnKg: 20_000,
  emission: { eiNoxGPerKg: 14 },
});

describe('screenAcrossMonths', () => {
  it('gives 12 rows, month 1..12, each the flight screened in that month', () => {
    const input = along45(45, -40);
    const rows = screenAcrossMonths(input);
    expect(rows.map((r) => r.month)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    for (const r of rows) {
      const own = screenFlight({ ...input, month: r.month });
      expect(r.noxAboveTropopauseKg).toBe(own.noxAboveTropopauseKg);
      expect(r.fractionAboveTropopause).toBe(own.fractionAboveTropopause);
      expect(r.ozoneLoss).toEqual({
        centralKg: own.ozoneLoss.centralKg,
        lowKg: own.ozoneLoss.lowKg,
        highKg: own.ozoneLoss.highKg,
      });
      expect(r.sameEveryMonth).toBe(false);
    }
  });

  it('puts more NOx above the tropopause in local winter than in local summer, in both hemispheres', () => {
    // Why: the extratropical tropopause is lower in winter (a colder, shallower troposphere; Mateus,
    // Mendes & Pires 2022 lookup table: about 10.1 km in January and 12.2 km in July at 45N, and
    // about 11.3 km in January and 10.4 km in July at 45S), so a level near it is above it more in winter.
    const north = screenAcrossMonths(along45(45, -40));
    const south = screenAcrossMonths(along45(-45, 140));
    const nox = (rows: typeof north, m: number) => rows[m - 1].noxAboveTropopauseKg;
    expect(nox(north, 1)).toBeGreaterThan(nox(north, 7));
    expect(nox(south, 7)).toBeGreaterThan(nox(south, 1));
    // Winter quarter against summer quarter, so the result does not hang on one month.
    const sum = (rows: typeof north, ms: number[]) => ms.reduce((t, m) => t + nox(rows, m), 0);
    expect(sum(north, [12, 1, 2])).toBeGreaterThan(sum(north, [6, 7, 8]));
    expect(sum(south, [6, 7, 8])).toBeGreaterThan(sum(south, [12, 1, 2]));
  });

  it('makes every month the same when the tropopause is given, and says so', () => {
    const input = { ...along45(45, -40), month: 3, tropopause: { altitudeM: 10_000 } };
    const rows = screenAcrossMonths(input);
    const own = screenFlight(input);
    for (const r of rows) {
      expect(r.sameEveryMonth).toBe(true);
      expect(r.tropopauseSource).toBe('override-altitude');
      expect(r.noxAboveTropopauseKg).toBe(own.noxAboveTropopauseKg);
      expect(r.ozoneLoss.centralKg).toBe(own.ozoneLoss.centralKg);
    }
    expect(SAME_EVERY_MONTH_NOTE).toMatch(/does not change with the month/);
  });

  it('refuses invalid input with the field named', () => {
    expect(() => screenAcrossMonths({ ...along45(45, 0), cruise: { flightLevel: 999 } })).toThrow(ScreeningInputError);
  });
});
