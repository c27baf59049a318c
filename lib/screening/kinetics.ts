/**
 * Gas-phase rate constants from JPL Publication 19-5 (Burkholder et al. 2019), parameters as listed
 * in its tables 1 (bimolecular) and 2 (termolecular) and its chemical-activation entry for O + NO2.
 * Bimolecular: k = A exp(-(E/R)/T). Termolecular: k0(T) = k0_300 (T/300)^-n, kinf(T) = kinf_300
 * (T/300)^-m (JPL tabulates both at 300 K), JPL fall-off form with broadening factor Fc = 0.6.
 * Chemical activation (JPL 19-5 section 2): k_ca = kca_inf(T) (1 - k_f([M],T) / kinf(T)), k_f the
 * fall-off rate of the competing association channel.
 */

/** Reactions the engine knows. */
export type Reaction = 'NO+O3' | 'NO2+O' | 'O+O3' | 'OH+O3' | 'HO2+O' | 'HO2+O3' | 'HO2+NO' | 'O+O2+M' | 'OH+NO2+M';

/** Arrhenius parameters: A in cm^3 molecule^-1 s^-1, E/R in K. */
export interface ArrheniusParameters {
  kind: 'arrhenius';
  a: number;
  eOverRK: number;
}

/** Termolecular parameters: k0 at 300 K (cm^6 molecule^-2 s^-1) with exponent n; kinf likewise. */
export interface TermolecularParameters {
  kind: 'termolecular';
  k0At300: number;
  n: number;
  kInfAt300: number | null;
  m: number;
}

/**
 * Chemical-activation parameters: the bimolecular channel's high-pressure Arrhenius form (A, E/R)
 * and the termolecular parameters of the association channel it competes with.
 */
export interface ChemicalActivationParameters {
  kind: 'chemical-activation';
  a: number;
  eOverRK: number;
  association: TermolecularParameters;
}

/** Reference temperature of the JPL termolecular parameters, K. */
export const JPL_TERMOLECULAR_REFERENCE_K = 300;

/**
 * JPL 19-5 parameters per reaction. Confirmed: the lines marked "CRACMM" agree digit for digit with
 * the CRACMM v1.0 mechanism of the US EPA CMAQ model, whose inorganic rate constants were updated to
 * JPL 19-5 in October 2021 (its mech.def diff: O3 + NO, O3P + O2 + M, NO + HO2, NO2 + O3P -> NO and
 * -> NO3, NO2 + HO -> HNO3), and termolecular limits are JPL 19-5 Table 2-1 values at 300 K. The
 * lines marked "unchanged" were not seen in a 19-5 table here: they agree with mechanisms built on
 * the earlier JPL evaluations (GEOS-Chem full chemistry, the GMI JPL 06-2 mechanism) and JPL 19-5's
 * k(298) in its Table 1 as recalled (from memory; tests/unit/screening/kinetics.test.ts).
 */
export const JPL_19_5: Readonly<
  Record<Reaction, ArrheniusParameters | TermolecularParameters | ChemicalActivationParameters>
> = Object.freeze({
  // CRACMM: O3 + NO = NO2, 3.0E-12 @ 1500.
  'NO+O3': { kind: 'arrhenius', a: 3.0e-12, eOverRK: 1500 },
  // CRACMM: NO2 + O3P = NO, 5.3E-12 @ -200; NO2 + O3P = NO3, 3.4E-31 ^ -1.6 & 2.3E-11 ^ -0.2
  // (k0 at 300 K with n = 1.6, kinf 2.3e-11 with m = 0.2): JPL 19-5's chemical-activation pair.
  'NO2+O': {
    kind: 'chemical-activation',
    a: 5.3e-12,
    eOverRK: -200,
    association: { kind: 'termolecular', k0At300: 3.4e-31, n: 1.6, kInfAt300: 2.3e-11, m: 0.2 },
  },
  // Unchanged: 8.0e-12 exp(-2060/T), k(298) 8.0e-15.
  'O+O3': { kind: 'arrhenius', a: 8.0e-12, eOverRK: 2060 },
  // Unchanged: 1.7e-12 exp(-940/T) (GEOS-Chem, GMI), k(298) 7.3e-14.
  'OH+O3': { kind: 'arrhenius', a: 1.7e-12, eOverRK: 940 },
  // Unchanged: 3.0e-11 exp(200/T) (GEOS-Chem), k(298) 5.9e-11.
  'HO2+O': { kind: 'arrhenius', a: 3.0e-11, eOverRK: -200 },
  // Unchanged: 1.0e-14 exp(-490/T) (GEOS-Chem, GMI), k(298) 1.9e-15.
  'HO2+O3': { kind: 'arrhenius', a: 1.0e-14, eOverRK: 490 },
  // CRACMM: NO + HO2 = NO2 + HO, 3.44E-12 @ -260 (one line: k(298) = 8.2e-12 follows from it).
  'HO2+NO': { kind: 'arrhenius', a: 3.44e-12, eOverRK: -260 },
  // CRACMM: O3P + O2 + M = O3, 6.10E-34 ^ -2.4 (low-pressure limit at 300 K).
  'O+O2+M': { kind: 'termolecular', k0At300: 6.1e-34, n: 2.4, kInfAt300: null, m: 0 },
  // CRACMM: NO2 + HO = HNO3, 1.80E-30 ^ -3.0 & 2.80E-11 ^ 0.0.
  'OH+NO2+M': { kind: 'termolecular', k0At300: 1.8e-30, n: 3.0, kInfAt300: 2.8e-11, m: 0 },
});

/** Broadening factor of the JPL fall-off expression. */
export const JPL_FALLOFF_FC = 0.6;

/** k = A exp(-(E/R)/T), no checks. */
export function arrhenius(a: number, eOverRK: number, temperatureK: number): number {
  return a * Math.exp(-eOverRK / temperatureK);
}

/** JPL low-pressure limit k0(T) = k0_300 (T/300)^-n, no checks. */
export function lowPressureLimit(k0At300: number, n: number, temperatureK: number): number {
  return k0At300 * Math.pow(temperatureK / JPL_TERMOLECULAR_REFERENCE_K, -n);
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

function termolecularRate(p: TermolecularParameters, temperatureK: number, airDensityCm3: number): number {
  const k0 = lowPressureLimit(p.k0At300, p.n, temperatureK);
  const kInf = (p.kInfAt300 as number) * Math.pow(temperatureK / JPL_TERMOLECULAR_REFERENCE_K, -p.m);
  return fallOff(k0, kInf, airDensityCm3);
}

/** k(OH + NO2 + M) effective bimolecular rate, cm^3 molecule^-1 s^-1, no checks. */
export function ohNo2Rate(temperatureK: number, airDensityCm3: number): number {
  return termolecularRate(JPL_19_5['OH+NO2+M'] as TermolecularParameters, temperatureK, airDensityCm3);
}

/**
 * k(O + NO2 -> NO + O2) in JPL 19-5's chemical-activation form, cm^3 molecule^-1 s^-1, no checks:
 * kca_inf(T) (1 - k_f([M],T) / kinf(T)) with k_f the O + NO2 + M -> NO3 fall-off rate.
 */
export function no2ORate(temperatureK: number, airDensityCm3: number): number {
  const p = JPL_19_5['NO2+O'] as ChemicalActivationParameters;
  const assoc = p.association;
  const kInf = (assoc.kInfAt300 as number) * Math.pow(temperatureK / JPL_TERMOLECULAR_REFERENCE_K, -assoc.m);
  const kf = termolecularRate(assoc, temperatureK, airDensityCm3);
  return arrhenius(p.a, p.eOverRK, temperatureK) * (1 - kf / kInf);
}

/**
 * Rate constant of `reaction` at `temperatureK` (K, 100..400) from JPL Publication 19-5:
 * bimolecular reactions in cm^3 molecule^-1 s^-1; 'O+O2+M' the low-pressure limit k0 in
 * cm^6 molecule^-2 s^-1; 'OH+NO2+M' the effective fall-off rate and 'NO2+O' the chemical-activation
 * rate, both in cm^3 molecule^-1 s^-1 and both needing the air number density `airDensityCm3`
 * (molecule cm^-3). RangeError on bad arguments.
 */
export function rateConstant(reaction: Reaction, temperatureK: number, airDensityCm3?: number): number {
  const p = (JPL_19_5 as Record<string, ArrheniusParameters | TermolecularParameters | ChemicalActivationParameters>)[
    reaction
  ];
  if (p === undefined) throw new RangeError(`Unknown reaction "${String(reaction)}".`);
  if (!Number.isFinite(temperatureK) || temperatureK < 100 || temperatureK > 400) {
    throw new RangeError(`The temperature must be between 100 and 400 K (got ${temperatureK}).`);
  }
  if (p.kind === 'arrhenius') return arrhenius(p.a, p.eOverRK, temperatureK);
  if (p.kind === 'termolecular' && p.kInfAt300 === null) return lowPressureLimit(p.k0At300, p.n, temperatureK);
  if (airDensityCm3 === undefined || !Number.isFinite(airDensityCm3) || airDensityCm3 <= 0) {
    throw new RangeError(
      `${reaction} is pressure dependent: give the air number density airDensityCm3 (molecule cm^-3, above 0).`,
    );
  }
  if (p.kind === 'chemical-activation') return no2ORate(temperatureK, airDensityCm3);
  return termolecularRate(p, temperatureK, airDensityCm3);
}
