import { describe, expect, it } from 'vitest';
import {
  BFFM2_INSTALLATION_FACTORS,
  bffm2EiNox,
  buildEiCurve,
  dlrEiNox,
  flightLevelToMetres,
  goffGratchSaturationPressurePa,
  isa,
  type EngineCertData,
} from '@/lib/screening';
import { evaluateEiCurve, humidityTerm, specificHumidityKgKg } from '@/lib/screening/emission-index';

// A plausible mid-size turbofan (invented; values of the order of mid-size turbofans in the ICAO
// engine emissions databank, from memory).
const TURBOFAN: EngineCertData = {
  fuelFlowKgS: [0.11, 0.33, 0.99, 1.21],
  eiNoxGPerKg: [4.6, 10.0, 22.5, 28.8],
};

function cruise(fl: number, fuelFlowPerEngineKgS: number, mach: number) {
  const s = isa(flightLevelToMetres(fl));
  return { fuelFlowPerEngineKgS, pressurePa: s.pressurePa, temperatureK: s.temperatureK, mach };
}

describe('Goff-Gratch saturation vapour pressure over water', () => {
  it.each([
    { t: 273.15, pa: 611.2, source: 'WMO reference: 6.112 hPa at 0 degC' },
    { t: 293.15, pa: 2339, source: 'steam tables: 2.339 kPa at 20 degC' },
    { t: 373.15, pa: 101_325, source: 'boiling point at 1013.25 hPa (the equation\'s steam point)' },
  ])('$source', ({ t, pa }) => {
    expect(Math.abs(goffGratchSaturationPressurePa(t) - pa) / pa).toBeLessThan(0.005);
  });

  it('H = -19.0 (omega - 0.00634) in size: +0.1205 for dry air, about -0.082 for saturated air at 15 °C, 1013.25 hPa (BFFM2, DuBois & Paynter 2006; 17.05 hPa saturation pressure at 15 °C from standard tables, from memory)', () => {
    expect(humidityTerm(0, 101_325, 288.15)).toBeCloseTo(19 * 0.00634, 12);
    const omegaSaturated = (0.62198 * 1705) / (101_325 - 1705);
    expect(humidityTerm(1, 101_325, 288.15)).toBeCloseTo(-19 * (omegaSaturated - 0.00634), 3);
  });

  it('60 % relative humidity at ISA sea level gives the BFFM2 reference humidity 0.00634 kg/kg, so H ~ 0 there (from memory: that is how the reference was chosen)', () => {
    expect(Math.abs(specificHumidityKgKg(0.6, 101_325, 288.15) - 0.00634)).toBeLessThan(0.0001);
    expect(Math.abs(humidityTerm(0.6, 101_325, 288.15))).toBeLessThan(0.002);
  });
});

describe('log-log certification curve', () => {
  const curve = buildEiCurve(TURBOFAN, BFFM2_INSTALLATION_FACTORS);

  it('passes through the four installation-corrected points (BFFM2 step 1-2, DuBois & Paynter 2006)', () => {
    for (let i = 0; i < 4; i++) {
      const wf = TURBOFAN.fuelFlowKgS[i] * BFFM2_INSTALLATION_FACTORS[i];
      expect(evaluateEiCurve(curve, wf)).toBeCloseTo(TURBOFAN.eiNoxGPerKg[i], 9);
    }
  });

  it('is linear in log-log between points (midpoint in log space gives the geometric mean)', () => {
    const w1 = TURBOFAN.fuelFlowKgS[1] * 1.02;
    const w2 = TURBOFAN.fuelFlowKgS[2] * 1.013;
    expect(evaluateEiCurve(curve, Math.sqrt(w1 * w2))).toBeCloseTo(Math.sqrt(10.0 * 22.5), 9);
  });

  it('extends the end segments as power laws beyond idle and take-off', () => {
    const w2 = TURBOFAN.fuelFlowKgS[2] * 1.013;
    const w3 = TURBOFAN.fuelFlowKgS[3] * 1.01;
    const slope = Math.log(28.8 / 22.5) / Math.log(w3 / w2);
    expect(evaluateEiCurve(curve, 2 * w3)).toBeCloseTo(28.8 * Math.pow(2, slope), 9);
  });

  it('installation factors are BFFM2 1.100 / 1.020 / 1.013 / 1.010 (idle, approach, climb-out, take-off; DuBois & Paynter 2006, SAE 2006-01-1987)', () => {
    expect(BFFM2_INSTALLATION_FACTORS).toEqual([1.1, 1.02, 1.013, 1.01]);
  });
});

describe('cruise EI NOx', () => {
  const bCurve = buildEiCurve(TURBOFAN, BFFM2_INSTALLATION_FACTORS);
  const dCurve = buildEiCurve(TURBOFAN);
  // Cruise fuel flow about 0.35 kg/s per engine for this class at FL350, Mach 0.78 (from memory).
  const c = cruise(350, 0.35, 0.78);

  it('BFFM2 gives a cruise EI in the typical 10-20 g/kg of modern subsonic turbofans (common practice, from memory)', () => {
    const ei = bffm2EiNox(bCurve, c).eiNoxGPerKg;
    expect(ei).toBeGreaterThan(10);
    expect(ei).toBeLessThan(20);
  });

  it('the DLR method also gives 10-20 g/kg and differs from BFFM2 by less than 30 % (commonly 10-25 %, common practice, from memory)', () => {
    const b = bffm2EiNox(bCurve, c).eiNoxGPerKg;
    const d = dlrEiNox(dCurve, c).eiNoxGPerKg;
    expect(d).toBeGreaterThan(10);
    expect(d).toBeLessThan(20);
    expect(Math.abs(d - b) / b).toBeLessThan(0.3);
  });

  it('BFFM2 at ISA sea level, static, 60 % RH reproduces the certification curve (delta = theta = 1, M = 0, H ~ 0)', () => {
    const s = { fuelFlowPerEngineKgS: 0.99 * 1.013, pressurePa: 101_325, temperatureK: 288.15, mach: 0, relativeHumidity: 0.6 };
    expect(Math.abs(bffm2EiNox(bCurve, s).eiNoxGPerKg - 22.5) / 22.5).toBeLessThan(0.005);
  });

  it('BFFM2 referred fuel flow follows Wf/delta theta^3.8 exp(0.2 M^2) (DuBois & Paynter 2006 step 4)', () => {
    const r = bffm2EiNox(bCurve, c);
    const delta = c.pressurePa / 101_325;
    const theta = c.temperatureK / 288.15;
    expect(r.referredFuelFlowKgS).toBeCloseTo((0.35 / delta) * Math.pow(theta, 3.8) * Math.exp(0.2 * 0.78 * 0.78), 12);
    expect(r.curvePosition).toBe(0);
  });

  it('flags a referred fuel flow beyond take-off (power-law extension)', () => {
    expect(bffm2EiNox(bCurve, cruise(350, 1.5, 0.85)).curvePosition).toBe(1);
  });

  it('more fuel flow at the same level gives more EI for a rising curve', () => {
    expect(bffm2EiNox(bCurve, cruise(350, 0.5, 0.78)).eiNoxGPerKg).toBeGreaterThan(bffm2EiNox(bCurve, c).eiNoxGPerKg);
  });
});
