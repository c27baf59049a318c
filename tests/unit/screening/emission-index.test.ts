import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
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
import { evaluateEiCurve, humidityTerm, humidityRatioKgKg } from '@/lib/screening/emission-index';

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
    { t: 373.15, pa: 101_325, source: "boiling point at 1013.25 hPa (the equation's steam point)" },
  ])('$source', ({ t, pa }) => {
    expect(Math.abs(goffGratchSaturationPressurePa(t) - pa) / pa).toBeLessThan(0.005);
  });

  it('60 % relative humidity at ISA sea level gives a humidity ratio of 0.00634 kg/kg, the ICAO reference humidity (from memory: that is how the reference was chosen)', () => {
    expect(Math.abs(humidityRatioKgKg(0.6, 101_325, 288.15) - 0.00634)).toBeLessThan(0.0001);
  });

  it('H = -19.0 (omega - 0.0063) with omega the mixing ratio 0.62198 phi Pv / (p - phi Pv) (DuBois & Paynter 2006), worked at FL350 ISA', () => {
    const p = 23_842.27;
    const t = 218.808;
    const pv = 0.6 * goffGratchSaturationPressurePa(t);
    const omega = (0.62198 * pv) / (p - pv);
    expect(humidityTerm(0.6, p, t)).toBeCloseTo(-19.0 * (omega - 0.0063), 12);
    // Python reimplementation of the same published formulas (outside this code base): H = 0.118564.
    expect(Math.abs(humidityTerm(0.6, p, t) - 0.118564) / 0.118564).toBeLessThan(0.003);
  });

  it('H = -19.0 (omega - 0.0063) in size: +0.1197 for dry air at 15 °C, 1013.25 hPa (BFFM2, DuBois & Paynter 2006)', () => {
    expect(humidityTerm(0, 101_325, 288.15)).toBeCloseTo(19 * 0.0063, 12);
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

  it('holds the end EI beyond idle and take-off: the correlation is valid between them only (SCIENCE.md section 2)', () => {
    const w3 = TURBOFAN.fuelFlowKgS[3] * 1.01;
    const w0 = TURBOFAN.fuelFlowKgS[0] * 1.1;
    expect(evaluateEiCurve(curve, 2 * w3)).toBeCloseTo(28.8, 9);
    expect(evaluateEiCurve(curve, 1000 * w3)).toBeCloseTo(28.8, 9);
    expect(evaluateEiCurve(curve, w0 / 10)).toBeCloseTo(4.6, 9);
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
    const s = {
      fuelFlowPerEngineKgS: 0.99 * 1.013,
      pressurePa: 101_325,
      temperatureK: 288.15,
      mach: 0,
      relativeHumidity: 0.6,
    };
    expect(Math.abs(bffm2EiNox(bCurve, s).eiNoxGPerKg - 22.5) / 22.5).toBeLessThan(0.005);
  });

  it('BFFM2 referred fuel flow follows Wf/delta theta^3.8 exp(0.2 M^2) (DuBois & Paynter 2006 step 4)', () => {
    const r = bffm2EiNox(bCurve, c);
    const delta = c.pressurePa / 101_325;
    const theta = c.temperatureK / 288.15;
    expect(r.referredFuelFlowKgS).toBeCloseTo((0.35 / delta) * Math.pow(theta, 3.8) * Math.exp(0.2 * 0.78 * 0.78), 12);
    expect(r.curvePosition).toBe(0);
  });

  it('flags a referred fuel flow beyond take-off (end EI held)', () => {
    expect(bffm2EiNox(bCurve, cruise(350, 1.5, 0.85)).curvePosition).toBe(1);
  });

  // Worked values, FL350 ISA (p 23 842.27 Pa, T 218.808 K), Mach 0.78, 0.35 kg/s per engine, 60 % RH.
  // Each step is the published formula; the literal is the same computation done independently in
  // Python. A 0.3 % pin catches a changed exponent (theta^3.0 instead of 3.3 moves BFFM2 by 4 %).
  it('BFFM2 worked value: Wff = 0.59016 kg/s, REI = 15.1753 g/kg, EI = 12.8655 g/kg (DuBois & Paynter 2006, SAE 2006-01-1987)', () => {
    const delta = 23_842.27 / 101_325;
    const theta = 218.808 / 288.15;
    const wff = (0.35 / delta) * Math.pow(theta, 3.8) * Math.exp(0.2 * 0.78 * 0.78);
    // Between approach (0.33 x 1.020) and climb-out (0.99 x 1.013), linear in log-log.
    const x0 = Math.log(0.33 * 1.02);
    const x1 = Math.log(0.99 * 1.013);
    const rei = Math.exp(Math.log(10.0) + ((Math.log(22.5) - Math.log(10.0)) * (Math.log(wff) - x0)) / (x1 - x0));
    const h = 0.118564;
    const ei = rei * Math.exp(h) * Math.sqrt(Math.pow(delta, 1.02) / Math.pow(theta, 3.3));
    expect(Math.abs(wff - 0.59016) / 0.59016).toBeLessThan(0.003);
    expect(Math.abs(rei - 15.1753) / 15.1753).toBeLessThan(0.003);
    expect(Math.abs(ei - 12.8655) / 12.8655).toBeLessThan(0.003);
    const r = bffm2EiNox(bCurve, {
      fuelFlowPerEngineKgS: 0.35,
      pressurePa: 23_842.27,
      temperatureK: 218.808,
      mach: 0.78,
    });
    expect(Math.abs(r.referredFuelFlowKgS - wff) / wff).toBeLessThan(0.003);
    expect(Math.abs(r.referenceEiGPerKg - rei) / rei).toBeLessThan(0.003);
    expect(Math.abs(r.eiNoxGPerKg - 12.8655) / 12.8655).toBeLessThan(0.003);
  });

  it('DLR worked value: Wf_ref = 1.07830 kg/s, EI_ref = 24.9935 g/kg, EI = 11.4480 g/kg (Deidewig, Doepelheuer & Lecht 1996, ICAS-96-4.1.2)', () => {
    const ram = 1 + 0.2 * 0.78 * 0.78;
    const deltaT = (23_842.27 * Math.pow(ram, 3.5)) / 101_325;
    const thetaT = (218.808 * ram) / 288.15;
    const wfRef = 0.35 / (deltaT * Math.sqrt(thetaT));
    // Between climb-out (0.99) and take-off (1.21), no installation factors.
    const x0 = Math.log(0.99);
    const x1 = Math.log(1.21);
    const eiRef = Math.exp(Math.log(22.5) + ((Math.log(28.8) - Math.log(22.5)) * (Math.log(wfRef) - x0)) / (x1 - x0));
    const ei = eiRef * Math.pow(deltaT, 0.4) * Math.pow(thetaT, 3) * Math.exp(0.118564);
    expect(Math.abs(wfRef - 1.0783) / 1.0783).toBeLessThan(0.003);
    expect(Math.abs(eiRef - 24.9935) / 24.9935).toBeLessThan(0.003);
    expect(Math.abs(ei - 11.448) / 11.448).toBeLessThan(0.003);
    const r = dlrEiNox(dCurve, {
      fuelFlowPerEngineKgS: 0.35,
      pressurePa: 23_842.27,
      temperatureK: 218.808,
      mach: 0.78,
    });
    expect(Math.abs(r.eiNoxGPerKg - 11.448) / 11.448).toBeLessThan(0.003);
  });

  it('the EI stays bounded for any fuel flow (fast-check): at most the take-off EI times the altitude and humidity factors', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1e6, noNaN: true }), fc.integer({ min: 200, max: 450 }), (wf, fl) => {
        const k = cruise(fl, wf, 0.8);
        for (const r of [bffm2EiNox(bCurve, k), dlrEiNox(dCurve, k)]) {
          expect(Number.isFinite(r.eiNoxGPerKg)).toBe(true);
          expect(r.referenceEiGPerKg).toBeLessThanOrEqual(28.8 + 1e-9);
          expect(r.referenceEiGPerKg).toBeGreaterThanOrEqual(4.6 - 1e-9);
        }
      }),
    );
  });

  it('more fuel flow at the same level gives more EI for a rising curve', () => {
    expect(bffm2EiNox(bCurve, cruise(350, 0.5, 0.78)).eiNoxGPerKg).toBeGreaterThan(bffm2EiNox(bCurve, c).eiNoxGPerKg);
  });
});
