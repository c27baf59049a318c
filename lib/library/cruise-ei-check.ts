// Imported from the modules themselves (not the engine's index) so the engine form can run the check in the browser.
import { flightLevelToMetres, isa } from '@/lib/screening/atmosphere';
import { BFFM2_INSTALLATION_FACTORS, bffm2EiNox, buildEiCurve } from '@/lib/screening/emission-index';

/**
 * A plausibility check of an engine's certification data: the BFFM2 cruise EI NOx at FL350,
 * Mach 0.80, ISA, relative humidity 0.6, at a cruise fuel flow of 30 % of the take-off fuel flow.
 * The 30 % is our rule of thumb for this check only (a typical cruise setting of a turbofan); a
 * screening uses the fuel the planner enters instead.
 */
export const CRUISE_CHECK = { flightLevel: 350, mach: 0.8, takeOffFraction: 0.3 } as const;

/** Typical cruise EI NOx of modern subsonic turbofans, g/kg (common practice). */
export const TYPICAL_CRUISE_EI_G_PER_KG = { low: 10, high: 20 } as const;

export interface CruiseEiCheck {
  eiNoxGPerKg: number;
  fuelFlowPerEngineKgS: number;
  /** Where the value sits against the typical band. */
  band: 'typical' | 'low' | 'high';
  /** True when the referred fuel flow fell outside the four certification points (power-law extension). */
  extrapolated: boolean;
}

export function cruiseEiCheck(engine: {
  fuelFlowKgS: readonly [number, number, number, number];
  eiNoxGPerKg: readonly [number, number, number, number];
}): CruiseEiCheck {
  const air = isa(flightLevelToMetres(CRUISE_CHECK.flightLevel));
  const fuelFlowPerEngineKgS = engine.fuelFlowKgS[3] * CRUISE_CHECK.takeOffFraction;
  const estimate = bffm2EiNox(buildEiCurve(engine, BFFM2_INSTALLATION_FACTORS), {
    fuelFlowPerEngineKgS,
    pressurePa: air.pressurePa,
    temperatureK: air.temperatureK,
    mach: CRUISE_CHECK.mach,
  });
  const ei = estimate.eiNoxGPerKg;
  return {
    eiNoxGPerKg: ei,
    fuelFlowPerEngineKgS,
    band: ei < TYPICAL_CRUISE_EI_G_PER_KG.low ? 'low' : ei > TYPICAL_CRUISE_EI_G_PER_KG.high ? 'high' : 'typical',
    extrapolated: estimate.curvePosition !== 0,
  };
}
