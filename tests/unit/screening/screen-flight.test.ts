import { describe, expect, it } from 'vitest';
import {
  ENGINE_VERSION,
  ScreeningInputError,
  climatologicalTropopause,
  isa,
  pressureAltitudeM,
  screenFlight,
  screenValidated,
  tropopauseFromSounding,
  validateScreeningInput,
  type ScreeningResult,
} from '@/lib/screening';

const TURBOFAN = { fuelFlowKgS: [0.11, 0.33, 0.99, 1.21], eiNoxGPerKg: [4.6, 10.0, 22.5, 28.8] };

const transatlantic = (over: Record<string, unknown> = {}) => ({
  route: { waypoints: [{ airport: 'EGLL' }, { airport: 'KJFK' }] },
  cruise: { flightLevel: 370 },
  mach: 0.82,
  fuelBurnKg: 25_000,
  emission: { eiNoxGPerKg: 14 },
  month: 1,
  ...over,
});

const sum = (r: ScreeningResult, f: (s: ScreeningResult['segments'][number]) => number) =>
  r.segments.reduce((a, s) => a + f(s), 0);

describe('the public result contract', () => {
  const r = screenFlight(transatlantic());

  it('carries every contract field', () => {
    for (const k of [
      'distanceKm',
      'fuelKg',
      'noxTotalKg',
      'noxAboveTropopauseKg',
      'noxAboveTropopauseKgN',
      'fractionAboveTropopause',
      'meanDepthAboveTropopauseKm',
      'eiMethod',
      'meanCruiseEiNoxGPerKg',
      'ozoneLoss',
      'segments',
      'cautions',
      'engineVersion',
    ])
      expect(r).toHaveProperty(k);
    for (const k of ['centralKg', 'lowKg', 'highKg', 'o3PerNox', 'chainLength', 'assumptions'])
      expect(r.ozoneLoss).toHaveProperty(k);
    for (const k of [
      'startKm',
      'endKm',
      'lat',
      'lon',
      'altitudeM',
      'tropopauseM',
      'fuelKg',
      'noxKg',
      'aboveTropopause',
    ]) {
      expect(r.segments[0]).toHaveProperty(k);
    }
    expect(r.engineVersion).toBe(ENGINE_VERSION);
    expect(ENGINE_VERSION).toBe('2026.12.4');
  });

  it('NOx = fuel x EI for a direct EI; N mass = 0.30446 x NO2 mass (molar masses 14.0067 / 46.0055); CO2 = 3.16 x fuel (ICAO CORSIA)', () => {
    expect(r.noxTotalKg).toBeCloseTo((25_000 * 14) / 1000, 6);
    expect(r.noxAboveTropopauseKgN / r.noxAboveTropopauseKg).toBeCloseTo(0.30446, 5);
    expect(r.co2Kg).toBeCloseTo(25_000 * 3.16, 6);
    expect(r.eiMethod).toBe('direct');
    expect(r.meanCruiseEiNoxGPerKg).toBeCloseTo(14, 9);
    expect(r.eiComparison).toBeUndefined();
  });

  it('segments add up to the totals', () => {
    expect(sum(r, (s) => s.fuelKg)).toBeCloseTo(r.fuelKg, 6);
    expect(sum(r, (s) => s.noxKg)).toBeCloseTo(r.noxTotalKg, 6);
    expect(sum(r, (s) => (s.aboveTropopause ? s.noxKg : 0))).toBeCloseTo(r.noxAboveTropopauseKg, 6);
    expect(sum(r, (s) => s.ozoneLossKg)).toBeCloseTo(r.ozoneLoss.centralKg, 6);
    expect(r.fractionAboveTropopause).toBeCloseTo(r.noxAboveTropopauseKg / r.noxTotalKg, 12);
  });

  it('compares aircraft and tropopause in pressure (ISA): above exactly when the level pressure is lower', () => {
    for (const s of r.segments) {
      expect(s.aboveTropopause).toBe(isa(s.altitudeM).pressurePa < isa(s.tropopauseM).pressurePa);
      expect(s.aboveTropopause).toBe(isa(s.altitudeM).pressurePa < s.tropopausePressureHpa * 100);
      expect(s.depthAboveTropopauseKm).toBeCloseTo(s.aboveTropopause ? (s.altitudeM - s.tropopauseM) / 1000 : 0, 9);
    }
  });

  it('mean depth is NOx-weighted over the segments above', () => {
    const above = r.segments.filter((s) => s.aboveTropopause);
    const w =
      above.reduce((a, s) => a + s.noxKg * s.depthAboveTropopauseKm, 0) / above.reduce((a, s) => a + s.noxKg, 0);
    expect(r.meanDepthAboveTropopauseKm).toBeCloseTo(w, 9);
  });

  it('ozone figure: low <= central <= high, o3PerNox and chain length positive when NOx is above', () => {
    expect(r.noxAboveTropopauseKg).toBeGreaterThan(0);
    expect(r.ozoneLoss.lowKg).toBeLessThanOrEqual(r.ozoneLoss.centralKg);
    expect(r.ozoneLoss.centralKg).toBeLessThanOrEqual(r.ozoneLoss.highKg);
    expect(r.ozoneLoss.o3PerNox).toBeGreaterThan(0);
    expect(r.ozoneLoss.chainLength).toBeGreaterThan(0);
    expect(r.ozoneLoss.assumptions.ozoneProfile.source).toMatch(/AFGL-TR-86-0110/);
    expect(r.ozoneLoss.assumptions.ozoneProfile.source).toMatch(/tables 1a-1e/);
  });

  it('states the fuel assumption (cruise fuel spread in proportion to time)', () => {
    expect(r.assumptions.join(' ')).toMatch(/in proportion to time/);
  });
});

describe('cautions shown with every result', () => {
  it('every result says: screening estimate, not certified/regulatory; gross not net; net production below 13-20 km; defer to approved methods', () => {
    const c = screenFlight(transatlantic()).cautions.join(' ');
    expect(c).toMatch(/not a certified emissions inventory/);
    expect(c).toMatch(/regulatory method/);
    expect(c).toMatch(/gross catalytic loss/);
    expect(c).toMatch(/not a net change/);
    expect(c).toMatch(/13-20 km/);
    expect(c).toMatch(/approved methods/);
    expect(c).not.toMatch(/subsonic/);
  });

  it('warns that fuel-flow correlations are subsonic when Mach > 1', () => {
    const sst = screenFlight(transatlantic({ mach: 1.8, cruise: { flightLevel: 580 }, emission: { eiNoxGPerKg: 8 } }));
    expect(sst.cautions.join(' ')).toMatch(/subsonic/);
    const cert = screenFlight(
      transatlantic({ mach: 1.8, cruise: { flightLevel: 580 }, emission: { engine: TURBOFAN, engineCount: 4 } }),
    );
    expect(cert.cautions.join(' ')).toMatch(/calibrated on subsonic engines/);
  });

  it('says the figure is zero by construction when all NOx is below the tropopause', () => {
    const r = screenFlight({
      route: { waypoints: [{ airport: 'WSSS' }, { airport: 'VHHH' }] },
      cruise: { flightLevel: 330 },
      fuelBurnKg: 9000,
      emission: { eiNoxGPerKg: 14 },
    });
    expect(r.noxAboveTropopauseKg).toBe(0);
    expect(r.ozoneLoss.centralKg).toBe(0);
    expect(r.ozoneLoss.o3PerNox).toBe(0);
    expect(r.ozoneLoss.chainLength).toBe(0);
    expect(r.meanDepthAboveTropopauseKm).toBe(0);
    expect(r.cautions.join(' ')).toMatch(/zero by construction/);
  });
});

describe('engine certification data', () => {
  // About 2.6 t/h for a twin of this class in cruise (0.36 kg/s per engine; from memory).
  const twin = transatlantic({
    fuelBurnKg: 18_000,
    mach: 0.78,
    cruise: { flightLevel: 350 },
    emission: { engine: TURBOFAN, engineCount: 2 },
  });

  it('BFFM2 by default, DLR beside it; mean cruise EI in the typical 10-20 g/kg (common practice, from memory)', () => {
    const r = screenFlight(twin);
    expect(r.eiMethod).toBe('bffm2');
    expect(r.eiComparison).toBeDefined();
    expect(r.meanCruiseEiNoxGPerKg).toBeCloseTo(r.eiComparison!.bffm2, 9);
    expect(r.meanCruiseEiNoxGPerKg).toBeGreaterThan(10);
    expect(r.meanCruiseEiNoxGPerKg).toBeLessThan(20);
  });

  it('uses the DLR method when asked', () => {
    const r = screenFlight({ ...twin, emission: { engine: TURBOFAN, engineCount: 2, method: 'dlr' } });
    expect(r.eiMethod).toBe('dlr');
    expect(r.meanCruiseEiNoxGPerKg).toBeCloseTo(r.eiComparison!.dlr, 9);
  });

  it("a lower relative humidity raises the EI (the sign of BFFM2's H = -19 (omega - 0.00634); its size is checked in emission-index.test.ts)", () => {
    const dry = screenFlight({ ...twin, assumptions: { relativeHumidity: 0 } });
    const moist = screenFlight({ ...twin, assumptions: { relativeHumidity: 1 } });
    expect(dry.meanCruiseEiNoxGPerKg).toBeGreaterThan(moist.meanCruiseEiNoxGPerKg);
  });
});

describe('fuel spread in proportion to time', () => {
  it('fuel per km at each level is inversely proportional to Mach x ISA speed of sound', () => {
    const r = screenFlight(
      transatlantic({
        cruise: {
          steps: [
            { fromKm: 0, flightLevel: 200 },
            { fromKm: 2000, flightLevel: 300 },
          ],
        },
      }),
    );
    const perKm = (fl: number) => {
      const s = r.segments.filter((x) => x.flightLevel === fl);
      return s.reduce((a, x) => a + x.fuelKg, 0) / s.reduce((a, x) => a + x.endKm - x.startKm, 0);
    };
    const a200 = isa(200 * 30.48).speedOfSoundMs;
    const a300 = isa(300 * 30.48).speedOfSoundMs;
    expect(perKm(200) / perKm(300)).toBeCloseTo(a300 / a200, 9);
    expect(r.cruiseTimeH).toBeCloseTo(
      (2000_000 / (0.82 * a200) + ((r.distanceKm - 2000) * 1000) / (0.82 * a300)) / 3600,
      9,
    );
  });

  it('ignores steps that start beyond the route end, with a caution', () => {
    const r = screenFlight(
      transatlantic({
        cruise: {
          steps: [
            { fromKm: 0, flightLevel: 350 },
            { fromKm: 9000, flightLevel: 390 },
          ],
        },
      }),
    );
    expect(r.segments.every((s) => s.flightLevel === 350)).toBe(true);
    expect(r.cautions.join(' ')).toMatch(/beyond the end of the route/);
  });
});

describe('season and tropopause source', () => {
  it('month wins over flight date', () => {
    const both = screenFlight(transatlantic({ month: 7, flightDate: '2026-01-15' }));
    const month = screenFlight(transatlantic({ month: 7 }));
    expect(both.month).toBe(7);
    expect(both.segments.map((s) => s.tropopauseM)).toEqual(month.segments.map((s) => s.tropopauseM));
  });

  it('a flight date uses its own day of year', () => {
    const r = screenFlight(transatlantic({ month: undefined, flightDate: '2026-03-01' }));
    expect(r.dayOfYear).toBe(60);
    // Day 60 lies between the February and March rows of the table, both winter columns in the north.
    const s = r.segments[10];
    const feb = climatologicalTropopause(s.lat, 2).pressureAltitudeM;
    const mar = climatologicalTropopause(s.lat, 3).pressureAltitudeM;
    expect(s.tropopauseM).toBeGreaterThanOrEqual(Math.min(feb, mar) - 1e-6);
    expect(s.tropopauseM).toBeLessThanOrEqual(Math.max(feb, mar) + 1e-6);
  });

  it('neither month nor date: annual-mean climatology', () => {
    const r = screenFlight(transatlantic({ month: undefined }));
    expect(r.month).toBeNull();
    for (const s of r.segments) {
      const tp = climatologicalTropopause(s.lat, null);
      expect(s.tropopauseM).toBeCloseTo(tp.pressureAltitudeM, 6);
      expect(s.tropopausePressureHpa).toBeCloseTo(tp.pressureHpa, 9);
    }
  });

  it('override by altitude and by pressure (ISA pressure altitude)', () => {
    const byAlt = screenFlight(transatlantic({ tropopause: { altitudeM: 12_000 } }));
    expect(byAlt.segments.every((s) => s.tropopauseM === 12_000 && s.tropopauseSource === 'override-altitude')).toBe(
      true,
    );
    expect(byAlt.noxAboveTropopauseKg).toBe(0);
    const byP = screenFlight(transatlantic({ tropopause: { pressureHpa: 250 } }));
    expect(byP.segments[0].tropopauseM).toBeCloseTo(pressureAltitudeM(25_000), 9);
    expect(byP.tropopauseSource).toBe('override-pressure');
    expect(byP.fractionAboveTropopause).toBe(1);
  });

  it('override by sounding: its WMO tropopause, compared in pressure', () => {
    const sounding = [0, 2, 4, 6, 8, 10, 11, 12, 13, 14, 16].map((km) => ({
      altitudeM: km * 1000,
      temperatureK: km <= 10 ? 290 - 6.5 * km : 225,
    }));
    const tp = tropopauseFromSounding(sounding)!;
    const r = screenFlight(transatlantic({ tropopause: { sounding } }));
    expect(r.tropopauseSource).toBe('sounding');
    expect(r.tropopause.sounding).toEqual(tp);
    expect(r.segments[0].tropopauseM).toBeCloseTo(pressureAltitudeM(tp.pressureHpa * 100), 6);
    expect(r.levels[0].temperatureSource).toBe('sounding');
    expect(r.levels[0].temperatureK).toBeCloseTo(225, 9);
  });

  it('a sounding without a tropopause falls back to the climatology with a caution', () => {
    const sounding = [0, 3, 6, 9, 12, 15].map((km) => ({ altitudeM: km * 1000, temperatureK: 300 - 6.5 * km }));
    const r = screenFlight(transatlantic({ tropopause: { sounding } }));
    expect(r.tropopauseSource).toBe('climatology');
    expect(r.cautions.join(' ')).toMatch(/no WMO lapse-rate tropopause/);
  });

  it('a bad sounding level is reported at tropopause.sounding.N.field', () => {
    const sounding = [
      { altitudeM: 9000, temperatureK: 229 },
      { altitudeM: 11_000, temperatureK: 12 },
      { altitudeM: 13_000, temperatureK: 216 },
    ];
    try {
      screenFlight(transatlantic({ tropopause: { sounding } }));
      throw new Error('expected an error');
    } catch (e) {
      expect(e).toBeInstanceOf(ScreeningInputError);
      expect((e as ScreeningInputError).fields.map((f) => f.path)).toContain('tropopause.sounding.1.temperatureK');
    }
  });
});

describe('assumption overrides', () => {
  const base = screenFlight(transatlantic());

  it('the ozone figure is linear in the NOx/NOy fraction (screening formula)', () => {
    const doubled = screenFlight(
      transatlantic({ assumptions: { noxToNoyFraction: { central: 0.4, low: 0.1, high: 0.4 } } }),
    );
    expect(doubled.ozoneLoss.centralKg / base.ozoneLoss.centralKg).toBeCloseTo(2, 9);
    expect(doubled.ozoneLoss.assumptions.noxToNoyFraction.source).toBe('given with the flight');
    expect(base.ozoneLoss.assumptions.noxToNoyFraction.source).toMatch(/default/);
  });

  it('a fixed ozone profile is used everywhere', () => {
    const r = screenFlight(transatlantic({ assumptions: { ozoneProfile: 'tropical' } }));
    expect(r.ozoneLoss.assumptions.ozoneProfile.profilesUsed).toEqual(['tropical']);
    expect(r.ozoneLoss.centralKg).toBeLessThan(base.ozoneLoss.centralKg);
  });

  it('doubling a custom ozone profile raises the figure 1.9 to 4 times (more ozone, more loss; the NO2 fraction shifts too)', () => {
    const flat = (ppmv: number) => ({ altitudeKm: [0, 40], ppmv: [ppmv, ppmv] });
    const one = screenFlight(transatlantic({ assumptions: { ozoneProfile: flat(0.5) } }));
    const two = screenFlight(transatlantic({ assumptions: { ozoneProfile: flat(1.0) } }));
    const ratio = two.ozoneLoss.centralKg / one.ozoneLoss.centralKg;
    expect(ratio).toBeGreaterThan(1.9);
    expect(ratio).toBeLessThan(4);
  });
});

describe('validated fast path', () => {
  it('screenValidated gives the same result as screenFlight on a validated input', () => {
    const raw = transatlantic({ emission: { engine: TURBOFAN, engineCount: 2 } });
    expect(screenValidated(validateScreeningInput(raw))).toEqual(screenFlight(raw));
  });
});

describe('inputs far outside what an engine does, and the sources named', () => {
  it('refuses (ScreeningInputError on fuelBurnKg, saying the implied flow per engine) a fuel burn far above any cruise fuel flow of the engine', () => {
    const big = transatlantic({
      route: { waypoints: [{ airport: 'EGLL' }, { airport: 'LFPG' }] },
      fuelBurnKg: 400_000,
      emission: { engine: TURBOFAN, engineCount: 2 },
    });
    try {
      screenFlight(big);
      throw new Error('expected a refusal');
    } catch (e) {
      expect(e).toBeInstanceOf(ScreeningInputError);
      const f = (e as ScreeningInputError).fields;
      expect(f.map((x) => x.path)).toEqual(['fuelBurnKg']);
      expect(f[0].message).toMatch(/implies \d+(\.\d+)? kg\/s per engine/);
      expect(f[0].message).toMatch(/take-off fuel flow \(1\.21 kg\/s\)/);
    }
  });

  it('a fuel flow above take-off but within reach holds the take-off EI and says so; no EI ever exceeds 200 g/kg', () => {
    const r = screenFlight(
      transatlantic({
        fuelBurnKg: 150_000,
        cruise: { flightLevel: 300 },
        emission: { engine: TURBOFAN, engineCount: 2 },
      }),
    );
    expect(
      r.cautions.some((c) => /valid from idle to take-off only, so the EI of that end point is held/.test(c)),
    ).toBe(true);
    for (const l of r.levels) expect(l.eiNoxGPerKg).toBeLessThanOrEqual(200);
  });

  it('cautions when the figure implies more than about 1000 O3 molecules per NOx molecule (inputs pushed to their bounds)', () => {
    const r = screenFlight(
      transatlantic({
        cruise: { flightLevel: 600 },
        mach: 2,
        month: 7,
        assumptions: {
          residenceTime: { depthKm: [0, 1], years: [5, 5], highFactor: 5 },
          noxToNoyFraction: 1,
          jO3NoonPerS: 1e-3,
          jNo2NoonPerS: 5e-3,
        },
      }),
    );
    expect(r.ozoneLoss.o3PerNox).toBeGreaterThan(1000);
    expect(r.cautions.some((c) => /O3 molecules destroyed per NOx molecule, above about 1000/.test(c))).toBe(true);
  });

  it('refuses overrides beyond physical bounds (residence above 5 years, J(NO2) outside 5e-3..2e-2 s^-1)', () => {
    expect(() =>
      screenFlight(transatlantic({ assumptions: { residenceTime: { depthKm: [0, 1], years: [6, 6] } } })),
    ).toThrow(ScreeningInputError);
    expect(() => screenFlight(transatlantic({ assumptions: { jNo2NoonPerS: 0.05 } }))).toThrow(ScreeningInputError);
  });

  it('a flight with no NOx names the profile of its own band (subarctic at 51N), not the tropical one', () => {
    const r = screenFlight(transatlantic({ emission: { eiNoxGPerKg: 0 }, month: 1 }));
    expect(r.ozoneLoss.localBudget.ozoneProfile).toBe('subarctic-winter');
  });

  it('the assumptions name their sources: the tropopause model and column, the sunlight geometry and dark conversion, JPL 19-5 and its confirmation, the residence descriptions, DuBois & Paynter', () => {
    const r = screenFlight(transatlantic({ emission: { engine: TURBOFAN, engineCount: 2 }, fuelBurnKg: 18_000 }));
    const text = r.assumptions.join(' ');
    expect(text).toMatch(/Mateus, Mendes & Pires \(2022\)/);
    expect(text).toMatch(/AFGL-TR-86-0110/);
    expect(text).toMatch(/Cooper \(1969\)/);
    expect(text).toMatch(/DuBois & Paynter 2006/);
    expect(r.ozoneLoss.assumptions.rateConstants).toMatch(/JPL Publication 19-5/);
    expect(r.ozoneLoss.assumptions.residenceTime.source).toMatch(/Waugh & Hall 2002/);
    expect(r.ozoneLoss.assumptions.residenceTime.source).toMatch(/IPCC 1999/);
    expect(r.ozoneLoss.assumptions.residenceTime.source).toMatch(/Ehhalt/);
    expect(r.ozoneLoss.assumptions.rateConstants).toMatch(/CRACMM v1\.0/);
    expect(r.ozoneLoss.assumptions.sunlight.source).toMatch(/exp\(-t\/tau\)/);
    expect(r.ozoneLoss.assumptions.sunlight.source).toMatch(/HNO3/);
    expect(r.ozoneLoss.assumptions.daylightFactor.source).toMatch(/solar geometry/);
    expect(r.ozoneLoss.assumptions.band).toMatch(/not a confidence interval/);
  });
});

describe('chemistry in the climatological column, and depth', () => {
  it("takes temperature at the flight level's height in the column, not the ISA: over the equator at FL550 the AFGL tropical column is near its 17 km cold point (194.8 K, AFGL-TR-86-0110 table 1a), 20 K colder than the ISA 216.65 K", () => {
    const r = screenFlight({
      route: {
        waypoints: [
          { lat: 0, lon: 0 },
          { lat: 0, lon: 20 },
        ],
      },
      cruise: { flightLevel: 550 },
      mach: 2,
      fuelBurnKg: 30_000,
      emission: { eiNoxGPerKg: 10 },
      month: 1,
    });
    expect(r.noxAboveTropopauseKg).toBeGreaterThan(0);
    expect(r.ozoneLoss.localBudget.ozoneProfile).toBe('tropical');
    expect(r.ozoneLoss.localBudget.temperatureK).toBeGreaterThan(194);
    expect(r.ozoneLoss.localBudget.temperatureK).toBeLessThan(200);
  });

  it('deeper above the tropopause, more loss per kg of NOx (longer residence, more ozone): FL600 against FL500 over 45N', () => {
    const at = (fl: number) => {
      const r = screenFlight({
        route: {
          waypoints: [
            { lat: 45, lon: 0 },
            { lat: 45, lon: 20 },
          ],
        },
        cruise: { flightLevel: fl },
        mach: 2,
        fuelBurnKg: 30_000,
        emission: { eiNoxGPerKg: 10 },
        month: 4,
      });
      return r.ozoneLoss.centralKg / r.noxAboveTropopauseKg;
    };
    expect(at(600)).toBeGreaterThan(at(500));
  });
});
