/**
 * Tropopass screening engine: pure functions, plain typed objects in and out. The names and shapes
 * here are the public engine contract; the `/api/v1` handlers wrap them.
 */
export {
  isa,
  pressureAltitudeM,
  flightLevelToMetres,
  geopotentialFromGeometricM,
  geometricFromGeopotentialM,
  ISA_MIN_ALTITUDE_M,
  ISA_MAX_ALTITUDE_M,
  ISA_MIN_PRESSURE_PA,
  ISA_MAX_PRESSURE_PA,
  type IsaState,
} from './atmosphere';
export {
  climatologicalTropopauseM,
  climatologicalTropopauseForDayM,
  climatologicalTropopause,
  tropopauseFromSounding,
  type SoundingTropopause,
} from './tropopause';
export { BTH_35PVU_KM, BTH_BANDS_DEG, BTH_DAYS, AFGL_PT, type ClimatologicalTropopause } from './climatology';
export { daySunlight, windowSunlight, solarDeclinationRad, type DaySunlight, type WindowSunlight } from './sunlight';
export { rateConstant, JPL_19_5, type Reaction } from './kinetics';
export {
  bffm2EiNox,
  dlrEiNox,
  buildEiCurve,
  goffGratchSaturationPressurePa,
  BFFM2_INSTALLATION_FACTORS,
  DEFAULT_RELATIVE_HUMIDITY,
  type EngineCertData,
  type EiCurve,
  type EiConditions,
  type EiEstimate,
} from './emission-index';
export {
  DEFAULT_OZONE_INPUTS,
  DAYLIGHT_FACTOR_EQUINOX,
  AFGL_O3_PPMV,
  AFGL_ALTITUDE_KM,
  FLEET_STUDIES,
  fleetOzoneColumnContext,
  type FleetContextEntry,
  type OddOxygenBudget,
} from './ozone-loss';
export { findAirport, searchAirports, type Airport } from './airports';
export { routeDistanceKm, MAX_SEGMENT_KM } from './great-circle';
export {
  parseFlightPlanRoute,
  expandFlightPlanInput,
  inputAsScreened,
  formatFlightPlanCoordinate,
  type FlightPlanRoute,
  type FlightPlanOptions,
  type FlightPlanFix,
  type FlightPlanAirway,
  type FlightPlanWaypoint,
  type FlightPlanSpeed,
  type FlightPlanItem,
  type UnresolvedItem,
  type RouteLibrary,
  type FlightPlanUsed,
} from './flight-plan';
export {
  screenFlight,
  screenValidated,
  screenTotals,
  ENGINE_VERSION,
  DEFAULT_MACH,
  type ScreeningResult,
  type ScreeningTotals,
  type ScreeningSegment,
  type ScreeningLevel,
  type OzoneLoss,
  type OzoneAssumptionsUsed,
  type TropopauseSource,
  type TropopauseUsed,
} from './screen-flight';
export {
  compareCruiseLevels,
  compareValidated,
  DEFAULT_LEVEL_DELTAS_FT,
  DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT,
  DEFAULT_MAX_FUEL_PENALTY_PCT,
  DEFAULT_MINIMISE,
  MARK_NAMES,
  type CruiseLevelRow,
  type MinimiseCriterion,
} from './compare-levels';
export {
  sampleUncertainty,
  sampleFigures,
  centralFigures,
  UNCERTAIN_INPUTS,
  BAND_INPUTS,
  DEFAULT_UNCERTAINTY_SAMPLES,
  DEFAULT_UNCERTAINTY_SEED,
  TROPOPAUSE_SIGMA_M,
  EI_LN_SIGMA,
  type ScreeningUncertainty,
  type Percentiles,
  type UncertainInput,
  type Driver,
  type UncertaintyDrivers,
  type SampledDistribution,
} from './uncertainty';
export { screenAcrossMonths, sweepMonthsValidated, SAME_EVERY_MONTH_NOTE, type MonthRow } from './month-sweep';
export {
  flightComponents,
  sampleFleet,
  sampleFleetParts,
  sampleFleetExact,
  encodeFlightComponents,
  decodeFlightComponents,
  FleetPack,
  screenWithComponents,
  FLIGHT_COMPONENTS_BYTES,
  SHARED_TROPOPAUSE_VARIANCE,
  type FlightComponents,
  type FleetUncertainty,
} from './fleet-uncertainty';
export { validateScreeningInput, validateCompareOptions, problemsFromZod } from './validate';
export { ScreeningInputError } from './errors';
export type { ScreeningInput, ScreeningInputRaw, FieldProblem, WaypointsScreeningInput } from '../validation/screening';
