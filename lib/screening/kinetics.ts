/**
 * Gas-phase rate constants from JPL Publication 19-5 (Burkholder et al. 2019), as listed in
 * Bimolecular: k = A exp(-(E/R)/T). Termolecular: k0(T) = k0_298 (T/298)^-n,
 * kinf(T) = kinf_298 (T/298)^-m, JPL fall-off form with broadening factor Fc = 0.6.
 */

/** Reactions the engine knows. */
export type Reaction =
  | 'NO+O3'
  | 'NO2+O'
  | 'O+O3'
  | 'OH+O3'
  | 'HO2+O'
  | 'HO2+O3'
  | 'HO2+NO'
  | 'O+O2+M'
  | 'OH+NO2+M';

/** Arrhenius parameters: A in cm^3 molecule^-1 s^-1, E/R in K. */
export interface ArrheniusParameters {
  kind: 'arrhenius';
  a: number;
  eOverRK: number;
}

/** Termolecular parameters: k0 at 298 K (cm^6 molecule^-2 s^-1) with exponent n; kinf likewise. */
export interface TermolecularParameters {
  kind: 'termolecular';
  k0At298: number;
  n: number;
  kInfAt298: number | null;
  m: number;
}

/** JPL 19-5 parameters per reaction. */
export const JPL_19_5: Readonly<Record<Reaction, ArrheniusParameters | TermolecularParameters>> = Object.freeze({
  'NO+O3': { kind: 'arrhenius', a: 3.0e-12, eOverRK: 1500 },
  // JPL 15-10 bimolecular form; 19-5's chemical-activation form agrees within 1 % at
  // stratospheric pressures.
  'NO2+O': { kind: 'arrhenius', a: 5.1e-12, eOverRK: -210 },
  'O+O3': { kind: 'arrhenius', a: 8.0e-12, eOverRK: 2060 },
  'OH+O3': { kind: 'arrhenius', a: 1.7e-12, eOverRK: 940 },
  'HO2+O': { kind: 'arrhenius', a: 3.0e-11, eOverRK: -200 },
  'HO2+O3': { kind: 'arrhenius', a: 1.0e-14, eOverRK: 490 },
  'HO2+NO': { kind: 'arrhenius', a: 3.44e-12, eOverRK: -260 },
  'O+O2+M': { kind: 'termolecular', k0At298: 6.1e-34, n: 2.4, kInfAt298: null, m: 0 },
  'OH+NO2+M': { kind: 'termolecular', k0At298: 1.8e-30, n: 3.0, kInfAt298: 2.8e-11, m: 0 },
});

/** Broadening factor of the JPL fall-off expression. */
export const JPL_FALLOFF_FC = 0.6;

/** k = A exp(-(E/R)/T), no checks. */
export function arrhenius(a: number, eOverRK: number, temperatureK: number): number {
  return a * Math.exp(-eOverRK / temperatureK);
}

/** JPL low-pressure limit k0(T) = k0_298 (T/298)^-n, no checks. */
export function lowPressureLimit(k0At298: number, n: number, temperatureK: number): number {
  return k0At298 * Math.pow(temperatureK / 298, -n);
}

/**
 * JPL fall-off: k = k0 M / (1 + k0 M / kinf) x Fc^(1 / (1 + log10(k0 M / kinf)^2)), no checks.
 * k0 in cm^6 molecule^-2 s^-1, kinf in cm^3 molecule^-1 s^-1, M in molecule cm^-3.
 */
export function fallOff(k0: number, kInf: number, airDensityCm3: number): number {
  const k0m = k0 * airDensityCm3;
  const r = k0m / kInf;
  const lg = Math.log10(r);
  return (k0m / (1 + r)) * Math.pow(JPL_FALLOFF_FC, 1 / (1 + lg * lg));
}

/** k(OH + NO2 + M) effective bimolecular rate, cm^3 molecule^-1 s^-1, no checks. */
export function ohNo2Rate(temperatureK: number, airDensityCm3: number): number {
  const p = JPL_19_5['OH+NO2+M'] as TermolecularParameters;
  const k0 = lowPressureLimit(p.k0At298, p.n, temperatureK);
  const kInf = (p.kInfAt298 as number) * Math.pow(temperatureK / 298, -p.m);
  return fallOff(k0, kInf, airDensityCm3);
}

/**
 * Rate constant of `reaction` at `temperatureK` (K, 100..400) from JPL Publication 19-5:
 * bimolecular reactions in cm^3 molecule^-1 s^-1; 'O+O2+M' the low-pressure limit k0 in
 * cm^6 molecule^-2 s^-1; 'OH+NO2+M' the effective fall-off rate in cm^3 molecule^-1 s^-1, which
 * needs the air number density `airDensityCm3` (molecule cm^-3). RangeError on bad arguments.
 */
export function rateConstant(reaction: Reaction, temperatureK: number, airDensityCm3?: number): number {
  const p = (JPL_19_5 as Record<string, ArrheniusParameters | TermolecularParameters>)[reaction];
  if (p === undefined) throw new RangeError(`Unknown reaction "${String(reaction)}".`);
  if (!Number.isFinite(temperatureK) || temperatureK < 100 || temperatureK > 400) {
    throw new RangeError(`The temperature must be between 100 and 400 K (got ${temperatureK}).`);
  }
  if (p.kind === 'arrhenius') return arrhenius(p.a, p.eOverRK, temperatureK);
  const k0 = lowPressureLimit(p.k0At298, p.n, temperatureK);
  if (p.kInfAt298 === null) return k0;
  if (airDensityCm3 === undefined || !Number.isFinite(airDensityCm3) || airDensityCm3 <= 0) {
    throw new RangeError(
      `${reaction} is pressure dependent: give the air number density airDensityCm3 (molecule cm^-3, above 0).`,
    );
  }
  const kInf = p.kInfAt298 * Math.pow(temperatureK / 298, -p.m);
  return fallOff(k0, kInf, airDensityCm3);
}
