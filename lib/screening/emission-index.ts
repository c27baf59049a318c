/**
 * Cruise EI NOx from engine certification data: Boeing Fuel Flow Method 2 (DuBois & Paynter 2006,
 * SAE 2006-01-1987; Baughcum et al. 1996, NASA CR-4700 App. D) and the DLR fuel-flow method
 * (Deidewig, Doepelheuer & Lecht 1996, ICAS-96-4.1.2; Schaefer & Bartosch 2013).
 * EI in g NO2 per kg fuel, fuel flow in kg/s per engine, pressure Pa, temperature K.
 */
import { P0_PA, T0_K } from './atmosphere';

/** Certification data, modes in the order [idle, approach, climb-out, take-off]. */
export interface EngineCertData {
  /** Fuel flow per engine, kg/s, rising idle -> take-off. */
  fuelFlowKgS: readonly [number, number, number, number];
  /** EI NOx, g NO2 per kg fuel, above 0. */
  eiNoxGPerKg: readonly [number, number, number, number];
}

/** BFFM2 installation factors on the certification fuel flows, [idle, approach, climb-out, take-off]. */
export const BFFM2_INSTALLATION_FACTORS = [1.1, 1.02, 1.013, 1.01] as const;

/** Default relative humidity (fraction) for the humidity correction: the usual BFFM2 default 0.6. */
export const DEFAULT_RELATIVE_HUMIDITY = 0.6;

/**
 * Reference humidity ratio of the humidity correction, kg water per kg dry air: DuBois & Paynter
 * (2006) write H = -19.0 (omega - 0.0063) with omega a mixing ratio (0.00634 is the ICAO reference
 * humidity; this engine uses the paper's 0.0063).
 */
export const REFERENCE_HUMIDITY_RATIO = 0.0063;

/**
 * A log-log EI curve through the four certification points: ln(fuel flow) and ln(EI) per point,
 * increasing in fuel flow. Evaluated piecewise linearly in ln-ln space between the points; outside
 * them the EI of the end point holds (the correlation is valid from idle to take-off only), and the
 * result says where the fuel flow fell.
 */
export interface EiCurve {
  lnFuelFlow: Float64Array;
  lnEi: Float64Array;
  slope: Float64Array;
}

/**
 * Builds the log-log curve of certification EI NOx (g/kg) against fuel flow (kg/s) times the given
 * per-mode factors (BFFM2 installation factors, or 1 for the DLR method). Points whose corrected fuel
 * flow does not rise are dropped (the higher mode wins), so the curve is always single-valued.
 */
export function buildEiCurve(engine: EngineCertData, factors: readonly number[] = [1, 1, 1, 1]): EiCurve {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < 4; i++) {
    const x = Math.log(engine.fuelFlowKgS[i] * factors[i]);
    const y = Math.log(engine.eiNoxGPerKg[i]);
    while (xs.length > 0 && x <= xs[xs.length - 1]) {
      xs.pop();
      ys.pop();
    }
    xs.push(x);
    ys.push(y);
  }
  if (xs.length === 1) {
    xs.unshift(xs[0] - 1);
    ys.unshift(ys[0]);
  }
  const slope = new Float64Array(xs.length - 1);
  for (let i = 0; i < slope.length; i++) slope[i] = (ys[i + 1] - ys[i]) / (xs[i + 1] - xs[i]);
  return { lnFuelFlow: Float64Array.from(xs), lnEi: Float64Array.from(ys), slope };
}

/** Where a fuel flow fell on the curve: -1 below the first point, +1 above the last, 0 inside. */
export type CurvePosition = -1 | 0 | 1;

/** EI (g/kg) on the curve at fuel flow `wf` (kg/s), held at the end points beyond them; no allocation. */
export function evaluateEiCurve(curve: EiCurve, wf: number): number {
  const xs = curve.lnFuelFlow;
  const n = xs.length;
  let x = Math.log(wf);
  if (!(x > xs[0])) x = xs[0];
  else if (x > xs[n - 1]) x = xs[n - 1];
  let i = 0;
  while (i < n - 2 && x > xs[i + 1]) i++;
  return Math.exp(curve.lnEi[i] + curve.slope[i] * (x - xs[i]));
}

/** Position of fuel flow `wf` relative to the curve's points. */
export function curvePosition(curve: EiCurve, wf: number): CurvePosition {
  const x = Math.log(wf);
  const xs = curve.lnFuelFlow;
  if (x < xs[0]) return -1;
  if (x > xs[xs.length - 1]) return 1;
  return 0;
}

/**
 * Saturation vapour pressure over liquid water, Pa, by the Goff-Gratch (1946) equation as given by
 * WMO (steam point 373.15 K, 1013.25 hPa). Valid in practice for about 173-373 K (over supercooled
 * water below 273.15 K, which is what the BFFM2 humidity correction uses).
 */
export function goffGratchSaturationPressurePa(temperatureK: number): number {
  const ts = 373.15;
  const r = ts / temperatureK;
  const log10Hpa =
    -7.90298 * (r - 1) +
    5.02808 * Math.log10(r) -
    1.3816e-7 * (Math.pow(10, 11.344 * (1 - 1 / r)) - 1) +
    8.1328e-3 * (Math.pow(10, -3.49149 * (r - 1)) - 1) +
    Math.log10(1013.25);
  return Math.pow(10, log10Hpa) * 100;
}

/**
 * Humidity ratio (mixing ratio, kg water per kg dry air) from relative humidity (fraction) as the
 * BFFM2 humidity correction writes it: omega = 0.62198 phi Pv / (p - phi Pv), Pv the Goff-Gratch
 * saturation pressure.
 */
export function humidityRatioKgKg(relativeHumidity: number, pressurePa: number, temperatureK: number): number {
  const pv = relativeHumidity * goffGratchSaturationPressurePa(temperatureK);
  return (0.62198 * pv) / Math.max(pressurePa - pv, 1e-9);
}

/** The humidity term H = -19.0 (omega - 0.0063) of BFFM2 (DuBois & Paynter 2006) and the DLR method. */
export function humidityTerm(relativeHumidity: number, pressurePa: number, temperatureK: number): number {
  return -19.0 * (humidityRatioKgKg(relativeHumidity, pressurePa, temperatureK) - REFERENCE_HUMIDITY_RATIO);
}

/** Ambient state for a fuel-flow correction. */
export interface EiConditions {
  /** Actual fuel flow per engine at cruise, kg/s. */
  fuelFlowPerEngineKgS: number;
  /** Static ambient pressure, Pa. */
  pressurePa: number;
  /** Static ambient temperature, K. */
  temperatureK: number;
  /** Flight Mach number. */
  mach: number;
  /** Relative humidity, fraction 0-1 (default 0.6). */
  relativeHumidity?: number;
}

/** A corrected cruise EI with its intermediate values. */
export interface EiEstimate {
  /** Cruise EI NOx, g NO2 per kg fuel. */
  eiNoxGPerKg: number;
  /** EI read off the certification curve at the referred fuel flow, g/kg. */
  referenceEiGPerKg: number;
  /** Referred (sea-level-equivalent) fuel flow per engine, kg/s. */
  referredFuelFlowKgS: number;
  /** exp(H), the humidity factor. */
  humidityFactor: number;
  /** -1 / +1 when the referred fuel flow lies below idle / above take-off (end EI held). */
  curvePosition: CurvePosition;
}

/**
 * Boeing Fuel Flow Method 2 cruise EI NOx (g/kg). Referred fuel flow Wff = (Wf/delta) theta^3.8
 * exp(0.2 M^2) with delta = p/101325, theta = T/288.15 (static ambient); REI from the log-log curve
 * through the installation-corrected certification points (`buildEiCurve(engine,
 * BFFM2_INSTALLATION_FACTORS)`); EI = REI exp(H) (delta^1.02 / theta^3.3)^0.5.
 */
export function bffm2EiNox(curve: EiCurve, c: EiConditions, humidity?: number): EiEstimate {
  const delta = c.pressurePa / P0_PA;
  const theta = c.temperatureK / T0_K;
  const wff = (c.fuelFlowPerEngineKgS / delta) * Math.pow(theta, 3.8) * Math.exp(0.2 * c.mach * c.mach);
  const rei = evaluateEiCurve(curve, wff);
  const h = humidity ?? humidityTerm(c.relativeHumidity ?? DEFAULT_RELATIVE_HUMIDITY, c.pressurePa, c.temperatureK);
  const hf = Math.exp(h);
  return {
    eiNoxGPerKg: rei * hf * Math.sqrt(Math.pow(delta, 1.02) / Math.pow(theta, 3.3)),
    referenceEiGPerKg: rei,
    referredFuelFlowKgS: wff,
    humidityFactor: hf,
    curvePosition: curvePosition(curve, wff),
  };
}

/**
 * DLR fuel-flow method cruise EI NOx (g/kg). Total inlet conditions Tt = T (1 + 0.2 M^2),
 * pt = p (1 + 0.2 M^2)^3.5; Wf_ref = Wf / (delta_t sqrt(theta_t)); EI = EI_ref(Wf_ref)
 * delta_t^0.4 theta_t^3 exp(H). EI_ref is read off the log-log curve through the certification points
 * as given (`buildEiCurve(engine)`, no installation factors: those belong to BFFM2).
 */
export function dlrEiNox(curve: EiCurve, c: EiConditions, humidity?: number): EiEstimate {
  const ram = 1 + 0.2 * c.mach * c.mach;
  const deltaT = (c.pressurePa * Math.pow(ram, 3.5)) / P0_PA;
  const thetaT = (c.temperatureK * ram) / T0_K;
  const wfRef = c.fuelFlowPerEngineKgS / (deltaT * Math.sqrt(thetaT));
  const eiRef = evaluateEiCurve(curve, wfRef);
  const h = humidity ?? humidityTerm(c.relativeHumidity ?? DEFAULT_RELATIVE_HUMIDITY, c.pressurePa, c.temperatureK);
  const hf = Math.exp(h);
  return {
    eiNoxGPerKg: eiRef * Math.pow(deltaT, 0.4) * thetaT * thetaT * thetaT * hf,
    referenceEiGPerKg: eiRef,
    referredFuelFlowKgS: wfRef,
    humidityFactor: hf,
    curvePosition: curvePosition(curve, wfRef),
  };
}
