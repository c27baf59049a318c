/**
 * `screenFlight`: one flight's cruise NOx, the NOx above the tropopause and the ozone-loss screening
 * figure, segment by segment (the public engine contract).
 */
import {
  GAMMA_AIR,
  R_AIR,
  geometricFromGeopotentialM,
  isaPressureAltitudeAt,
  isaPressureAt,
  isaTemperatureAt,
  METRES_PER_FLIGHT_LEVEL,
} from './atmosphere';
import { AFGL_COLUMN_SOURCE, BTH_SOURCE, COLUMNS, bthHeightKm, bthRowForDay, columnPressurePa } from './climatology';
import {
  BFFM2_INSTALLATION_FACTORS,
  bffm2EiNox,
  buildEiCurve,
  dlrEiNox,
  humidityTerm,
  type CurvePosition,
  type EiCurve,
} from './emission-index';
import { ScreeningInputError } from './errors';
import {
  chemistryAt,
  AFGL_SOURCE,
  COEFFICIENT_COUNT,
  CUSTOM_PROFILE_SLOT,
  DEFAULT_OZONE_INPUTS,
  MOLAR_MASS_N,
  MOLAR_MASS_NO2,
  PROFILE_SLOTS,
  RESIDENCE_SOURCE,
  airNumberDensityCm3,
  fleetOzoneColumnContext,
  lossPerNoxYear,
  noxMolecules,
  oddOxygenBudget,
  ozoneKg,
  ozoneLossCoefficients,
  ozonePpmv,
  profileSlotFor,
  resolveOzoneInputs,
  residenceTimeYears,
  type Band,
  type FleetContextEntry,
  type OddOxygenBudget,
  type OzoneInputs,
  type ProfileSlotName,
} from './ozone-loss';
import { EARTH_RADIUS_M, MAX_SEGMENT_KM, planRoute, resolveWaypoints, type RoutePlan } from './great-circle';
import { windowSunlight, type WindowSunlight } from './sunlight';
import type { FlightPlanUsed, RouteLibrary } from './flight-plan';
import { expandRouteInput } from './route-input';
import type { TrackUsed } from './track';
import {
  MID_MONTH_DAY_OF_YEAR,
  completeSounding,
  soundingTemperatureAtPressure,
  wmoTropopause,
  type SoundingProfile,
  type SoundingTropopause,
} from './tropopause';
import { sampleUncertainty, type ScreeningUncertainty } from './uncertainty';
import { validateScreeningInput } from './validate';
import { OZONE_PROFILE_NAMES, SCREENING_LIMITS, type ScreeningInput } from '../validation/screening';

/** Version of the methods; saved results carry it so they can be told apart and recomputed. */
export const ENGINE_VERSION = '2026.12.4';

/** Default cruise Mach used for timing. */
export const DEFAULT_MACH = 0.8;

/** kg CO2 per kg of Jet A/A-1 (ICAO CORSIA). */
export const CO2_PER_KG_FUEL = 3.16;

/** How a segment's tropopause was obtained. */
export type TropopauseSource = 'climatology' | 'override-altitude' | 'override-pressure' | 'sounding';

/** One screened segment (at most 50 km). Distances km, altitudes geopotential m, masses kg. */
export interface ScreeningSegment {
  startKm: number;
  endKm: number;
  /** Segment midpoint, degrees. */
  lat: number;
  lon: number;
  flightLevel: number;
  /** Pressure altitude of the flight level, m. */
  altitudeM: number;
  /** Tropopause as ISA pressure altitude, m, comparable with `altitudeM` (comparisons are made in pressure). */
  tropopauseM: number;
  /** Tropopause pressure, hPa. */
  tropopausePressureHpa: number;
  tropopauseSource: TropopauseSource;
  fuelKg: number;
  /** NOx, kg NO2-equivalent. */
  noxKg: number;
  aboveTropopause: boolean;
  /** Depth above the tropopause, km (0 below it). */
  depthAboveTropopauseKm: number;
  /** Central ozone-loss figure of the segment, kg O3 (0 below the tropopause). */
  ozoneLossKg: number;
}

/** One cruise level of the flight with its conditions and EI. */
export interface ScreeningLevel {
  flightLevel: number;
  altitudeM: number;
  pressureHpa: number;
  temperatureK: number;
  temperatureSource: 'isa' | 'sounding';
  trueAirspeedMs: number;
  distanceKm: number;
  fuelKg: number;
  noxKg: number;
  noxAboveTropopauseKg: number;
  eiNoxGPerKg: number;
  eiBffm2GPerKg: number | null;
  eiDlrGPerKg: number | null;
}

/** The assumptions behind the ozone figure, with sources. */
export interface OzoneAssumptionsUsed {
  ozoneProfile: { choice: string; profilesUsed: ProfileSlotName[]; source: string };
  jO3NoonPerS: Band & { source: string };
  jNo2NoonPerS: Band & { source: string };
  /** Daylight factor used: given with the flight, or the NOx-weighted value derived from solar geometry. */
  daylightFactor: Band & { source: string };
  /** Solar geometry behind the J scaling and the daylight factor (NOx-weighted over the segments). */
  sunlight: {
    dayFraction: number;
    meanCosZenith: number;
    daytimeCosZenith: number;
    /** NOx-weighted e-folding residence the sunlight is weighted over, years. */
    residenceWindowYears: number;
    /** Weighted sunlit fraction of the day from geometry alone (before the dark conversion). */
    sunlitFraction: number;
    /** Share of the sunlit time the emission is active as NOx (1 without polar night; dark conversion to HNO3). */
    activeShare: number;
    source: string;
  };
  noxToNoyFraction: Band & { source: string };
  residenceTime: {
    depthKm: readonly number[];
    years: readonly number[];
    tropicalYears: readonly number[] | null;
    lowFactor: number;
    highFactor: number;
    interpolation: string;
    source: string;
  };
  ohCm3: { value: number; source: string };
  ho2Cm3: { value: number; source: string };
  rateConstants: string;
  band: string;
  formula: string;
}

/** The ozone-loss screening figure of a flight. */
export interface OzoneLoss {
  /** Gross catalytic O3 destroyed, kg: central, low and high (every input at its low / high end together: a screening range, not a confidence interval). */
  centralKg: number;
  lowKg: number;
  highKg: number;
  /** O3 molecules destroyed per NOx molecule emitted above the tropopause (0 when none). */
  o3PerNox: number;
  /** NOx-weighted local daytime chain length k(NO2+O)[O] / (k(OH+NO2+M)[OH]) (0 when none). */
  chainLength: number;
  assumptions: OzoneAssumptionsUsed;
  /** Local odd-oxygen loss budget at the main injection level, for the analyst. */
  localBudget: OddOxygenBudget;
  /** Fleet-scale column context, applicable only at the studies' altitudes. */
  fleetContext: { basis: string; studies: FleetContextEntry[] };
  note: string;
}

/** The tropopause used for the flight. */
export interface TropopauseUsed {
  source: TropopauseSource;
  description: string;
  /** Constant tropopause pressure altitude (m) for overrides and soundings, null for climatology. */
  altitudeM: number | null;
  /** Constant tropopause pressure (hPa), null for climatology. */
  pressureHpa: number | null;
  /** The sounding's WMO tropopause, when a sounding was given and had one. */
  sounding: SoundingTropopause | null;
}

/** Result of `screenFlight` (the public contract fields plus extras). */
export interface ScreeningResult {
  engineVersion: string;
  distanceKm: number;
  fuelKg: number;
  co2Kg: number;
  cruiseTimeH: number;
  noxTotalKg: number;
  noxAboveTropopauseKg: number;
  /** NOx above the tropopause as mass of N, kg (0.30446 x NO2 mass). */
  noxAboveTropopauseKgN: number;
  fractionAboveTropopause: number;
  meanDepthAboveTropopauseKm: number;
  eiMethod: 'direct' | 'bffm2' | 'dlr';
  meanCruiseEiNoxGPerKg: number;
  eiComparison?: { bffm2: number; dlr: number };
  month: number | null;
  dayOfYear: number | null;
  tropopause: TropopauseUsed;
  tropopauseSource: TropopauseSource;
  levels: ScreeningLevel[];
  ozoneLoss: OzoneLoss;
  segments: ScreeningSegment[];
  cautions: string[];
  assumptions: string[];
  /** Percentiles from sampling the uncertain inputs, when the input asked for them. */
  uncertainty?: ScreeningUncertainty;
  /** What was understood of a flight-plan route: present when the route was given as one. */
  flightPlan?: FlightPlanUsed;
  /** What was made of a flown track: present when the route was given as one. */
  track?: TrackUsed;
}

interface IsaLevel {
  altitudeM: number;
  pressurePa: number;
  temperatureK: number;
  speedOfSoundMs: number;
  geometricKm: number;
  airDensityCm3: number;
  humidityDefault: number;
}

const ISA_LEVEL_CACHE: (IsaLevel | undefined)[] = [];
const DEFAULT_COEF_CACHE: (Float64Array | undefined)[] = [];
const SLOT_COUNT = PROFILE_SLOTS.length;

function isaLevel(fl: number): IsaLevel {
  const cacheable = Number.isInteger(fl) && fl >= 0 && fl <= 1000;
  if (cacheable) {
    const hit = ISA_LEVEL_CACHE[fl];
    if (hit !== undefined) return hit;
  }
  const h = fl * METRES_PER_FLIGHT_LEVEL;
  const t = isaTemperatureAt(h);
  const p = isaPressureAt(h);
  const lvl: IsaLevel = {
    altitudeM: h,
    pressurePa: p,
    temperatureK: t,
    speedOfSoundMs: Math.sqrt(GAMMA_AIR * R_AIR * t),
    geometricKm: geometricFromGeopotentialM(h) / 1000,
    airDensityCm3: airNumberDensityCm3(p, t),
    humidityDefault: humidityTerm(DEFAULT_OZONE_INPUTS.relativeHumidity, p, t),
  };
  if (cacheable) ISA_LEVEL_CACHE[fl] = lvl;
  return lvl;
}

interface LevelContext {
  fl: number;
  isa: IsaLevel;
  /** Temperature for the EI correction: ISA, or the sounding where it covers the level. */
  temperatureK: number;
  temperatureSource: 'isa' | 'sounding';
  tasMs: number;
  ei: number;
  eiBffm2: number;
  eiDlr: number;
  curvePosition: CurvePosition;
  cacheable: boolean;
  coef: (Float64Array | undefined)[];
  noxBySlot: Float64Array;
  noxAboveBySlot: Float64Array;
  latNoxBySlot: Float64Array;
  distanceKm: number;
  fuelKg: number;
  noxKg: number;
  noxAboveKg: number;
}

/** The chemistry state at a level in the column of an ozone slot: T, [M] and the geometric height for O3. */
function chemistryState(level: LevelContext, slot: number): { t: number; m: number; zKm: number } {
  const sounding = level.temperatureSource === 'sounding';
  return chemistryAt(level.isa.pressurePa, slot, level.temperatureK, sounding, level.isa.geometricKm);
}

function levelCoefficients(level: LevelContext, slot: number, inputs: OzoneInputs): Float64Array {
  const own = level.coef[slot];
  if (own !== undefined) return own;
  let c: Float64Array | undefined;
  const key = level.fl * SLOT_COUNT + slot;
  if (level.cacheable) c = DEFAULT_COEF_CACHE[key];
  if (c === undefined) {
    c = new Float64Array(COEFFICIENT_COUNT);
    const custom =
      typeof inputs.ozoneProfile === 'object' && inputs.ozoneProfile !== null ? inputs.ozoneProfile : undefined;
    const st = chemistryState(level, slot);
    ozoneLossCoefficients(st.t, st.m, ozonePpmv(slot, st.zKm, custom), inputs, c);
    if (level.cacheable) DEFAULT_COEF_CACHE[key] = c;
  }
  level.coef[slot] = c;
  return c;
}

const TROPOPAUSE_SOURCE_TEXT: Record<TropopauseSource, string> = {
  climatology: `Climatological tropopause by latitude and season: ${BTH_SOURCE}. Its geometric height is placed in pressure through the climatological column of the segment's band and season (${AFGL_COLUMN_SOURCE}) and compared with the flight level's ISA pressure.`,
  'override-altitude':
    'Tropopause altitude given with the flight, taken as an ISA pressure altitude and compared in pressure.',
  'override-pressure': "Tropopause pressure given with the flight, compared with the flight level's ISA pressure.",
  sounding: 'WMO (1957) lapse-rate tropopause of the sounding given with the flight, compared in pressure.',
};

const BASE_CAUTIONS: readonly string[] = Object.freeze([
  'Screening estimate for planning and reporting support: not a certified emissions inventory and not a regulatory method.',
  'The ozone figure is a gross catalytic loss by the added NOx, not a net change of the ozone column: halogen and aerosol chemistry buffer it, and below about 13-20 km the same NOx also makes ozone (HO2 + NO), so there the net effect is likely ozone production.',
  "Follow the operator's approved methods and the applicable regulation; these figures do not replace them.",
]);

const OZONE_NOTE =
  'Gross catalytic odd-oxygen destruction by the NOx emitted above the tropopause, not a net column change; below about 13-20 km the NOx also produces ozone. Low and high take every input at its low (high) end together: a screening range, not a confidence interval.';

const SOURCE_DEFAULT =
  'default: screening value of the right order of magnitude, given from memory; override it with a published value where one is adopted';
const SOURCE_J =
  'default: overhead-sun reference, given from memory, scaled by the daytime-mean cos of the solar zenith angle (a screening approximation: J falls more slowly than cos zenith)';
const SOURCE_INPUT = 'given with the flight';
const SUN_SOURCE =
  "Solar declination by Cooper (1969), daily-mean cos zenith and day length from the sunset hour angle, for each segment's latitude, weighted by the share of the emission still above the tropopause, exp(-t/tau) with tau the central residence (e-folding) time, from the flight date on (the mid-month day with a month; all start days alike without either). In polar night the NOx turns into HNO3 within days (NO2 + O3, N2O5 hydrolysis on sulfate aerosol; e-folding 5 days when nights exceed 18 h) and comes back only in sunlight (HNO3 photolysis and OH, e-folding 60 days under an equinoctial equatorial sun, slower under a low sun; Brasseur & Solomon 2005, ch. 5, from memory): the loss counts only the active share";

const FORMULA =
  "O3 destroyed = N_NOx x 2 k(NO2+O)(T,[M]) [O] x D x f_NO2 x f_NOx/NOy x tau(latitude, depth); [O] = [O3] s J(O3) / (k(O+O2+M) [O2] [M]); f_NO2 from [NO2]/[NO] = k(NO+O3)[O3] / (s J(NO2) + k(NO2+O)[O]); s the daytime-mean cos zenith and D the sunlit fraction times the active NOx share, both weighted by exp(-t/tau) over the stay; T, [M] and [O3] at the flight level's height in the climatological column.";
const BAND_TEXT =
  'Low and high: every input at its low (high) end together (J(O3), f_NOx/NOy and residence time low with J(NO2) high, and the reverse): a deliberately wide screening range, not a confidence interval.';
const TAU_TEXT =
  'Linear in depth between nodes at the lower edge of each depth band, flat beyond the last node (never below a band value inside the band); tropical table up to 20 degrees, extratropical from 30 degrees, linear between.';

function describeBand(v: unknown, b: Band, source = SOURCE_DEFAULT): Band & { source: string } {
  return { central: b.central, low: b.low, high: b.high, source: v === undefined ? source : SOURCE_INPUT };
}

/** NOx-weighted sunlight sums of a flight, for the assumptions. */
interface SunSums {
  nox: number;
  dayFraction: number;
  meanCos: number;
  daytimeCos: number;
  tauYears: number;
  sunlit: number;
}

function describeAssumptions(
  a: ScreeningInput['assumptions'],
  inputs: OzoneInputs,
  slotsUsed: number,
  sun: SunSums,
): OzoneAssumptionsUsed {
  const profilesUsed: ProfileSlotName[] = [];
  for (let s = 0; s < SLOT_COUNT; s++) if (slotsUsed & (1 << s)) profilesUsed.push(PROFILE_SLOTS[s]);
  const p = inputs.ozoneProfile;
  const choice =
    p === null
      ? 'AFGL profile by latitude band (tropical |lat| < 23.5, mid-latitude 23.5-50, subarctic > 50) and season (summer April-September in the north, October-March in the south; annual mean of summer and winter without a month)'
      : typeof p === 'string'
        ? `AFGL ${p} atmosphere (ozone, temperature and density) for the chemistry of every segment (given with the flight); the tropopause stays in the column of each segment's band and season`
        : 'Ozone profile given with the flight (temperature and height from the ISA at each level)';
  const mean = (x: number): number => (sun.nox > 0 ? x / sun.nox : 0);
  const d = mean(sun.dayFraction);
  const dl = inputs.daylightFactor;
  return {
    ozoneProfile: { choice, profilesUsed, source: p !== null && typeof p === 'object' ? SOURCE_INPUT : AFGL_SOURCE },
    jO3NoonPerS: describeBand(a?.jO3NoonPerS, inputs.jO3NoonPerS, SOURCE_J),
    jNo2NoonPerS: describeBand(a?.jNo2NoonPerS, inputs.jNo2NoonPerS, SOURCE_J),
    daylightFactor:
      dl === null
        ? {
            central: d,
            low: d,
            high: d,
            source: `derived: sunlit fraction of the day from solar geometry times the share of the emission active as NOx (${SUN_SOURCE})`,
          }
        : describeBand(a?.daylightFactor, dl),
    sunlight: {
      dayFraction: d,
      meanCosZenith: mean(sun.meanCos),
      daytimeCosZenith: mean(sun.daytimeCos),
      residenceWindowYears: mean(sun.tauYears),
      sunlitFraction: mean(sun.sunlit),
      activeShare: sun.sunlit > 0 ? sun.dayFraction / sun.sunlit : 1,
      source: SUN_SOURCE,
    },
    noxToNoyFraction: describeBand(a?.noxToNoyFraction, inputs.noxToNoyFraction),
    residenceTime: {
      depthKm: inputs.residenceTime.depthKm,
      years: inputs.residenceTime.years,
      tropicalYears: inputs.residenceTime.tropicalYears,
      lowFactor: inputs.residenceTime.lowFactor,
      highFactor: inputs.residenceTime.highFactor,
      interpolation: TAU_TEXT,
      source: a?.residenceTime === undefined ? RESIDENCE_SOURCE : SOURCE_INPUT,
    },
    ohCm3: {
      value: inputs.ohCm3,
      source: a?.ohCm3 === undefined ? `${SOURCE_DEFAULT}; daytime, for the chain length` : SOURCE_INPUT,
    },
    ho2Cm3: {
      value: inputs.ho2Cm3,
      source:
        a?.ho2Cm3 === undefined
          ? 'default: 5 x [OH], lower-stratosphere daytime ratio from memory; local budget only'
          : SOURCE_INPUT,
    },
    rateConstants:
      'JPL Publication 19-5 (Burkholder et al. 2019): Arrhenius and termolecular parameters (k0, kinf at 300 K), NO2 + O in the chemical-activation form with [M]; NO + O3, O + NO2 (both channels), O + O2 + M, OH + NO2 + M and HO2 + NO as in CRACMM v1.0 (US EPA CMAQ, inorganic rate constants updated to JPL 19-5 in 2021)',
    band: BAND_TEXT,
    formula: FORMULA,
  };
}

function dayOfYear(date: string): number {
  const y = Number(date.slice(0, 4));
  const m = Number(date.slice(5, 7));
  const d = Number(date.slice(8, 10));
  return (Date.UTC(y, m - 1, d) - Date.UTC(y, 0, 1)) / 86_400_000 + 1;
}

function fmt(x: number, digits = 0): string {
  return x.toFixed(digits);
}

/**
 * The figures of a screening without its per-segment and descriptive parts: what a what-if level
 * row or an imported flight keeps. Equal to the same fields of `screenValidated` for the same input.
 */
export interface ScreeningTotals {
  engineVersion: string;
  distanceKm: number;
  fuelKg: number;
  noxTotalKg: number;
  noxAboveTropopauseKg: number;
  fractionAboveTropopause: number;
  meanDepthAboveTropopauseKm: number;
  ozoneLoss: Pick<OzoneLoss, 'centralKg' | 'lowKg' | 'highKg' | 'o3PerNox' | 'chainLength'>;
}

/**
 * Screens one flight from an already-validated input (the output of `validateScreeningInput` or
 * `screeningInputSchema.parse`), skipping schema validation. Throws ScreeningInputError only for
 * what the schema cannot know: unknown airports, a route with no length or antipodal legs, a
 * sounding whose levels contradict each other, and a fuel burn that implies a fuel flow per engine
 * far outside what the engine does.
 */
export function screenValidated(input: ScreeningInput, library?: RouteLibrary): ScreeningResult {
  const result = screenCore(input, true, library);
  if (input.uncertainty !== undefined) {
    // The sampler screens again from waypoints: give it the route as read, not the flight-plan text.
    const sampled =
      input.route !== undefined && 'waypoints' in input.route ? input : expandRouteInput(input, library).input;
    result.uncertainty = sampleUncertainty(sampled, result);
  }
  return result;
}

/** As `screenValidated`, returning only the totals: no segments, texts, local budget or fleet context. */
export function screenTotals(input: ScreeningInput, library?: RouteLibrary): ScreeningTotals {
  return screenCore(input, false, library);
}

/** Season of a flight: month wins over flight date; neither gives the annual mean. */
interface Season {
  month: number | null;
  doy: number | null;
}

function resolveSeason(input: ScreeningInput): Season {
  if (input.month !== undefined) return { month: input.month, doy: MID_MONTH_DAY_OF_YEAR[input.month - 1] };
  if (input.flightDate !== undefined)
    return { month: Number(input.flightDate.slice(5, 7)), doy: dayOfYear(input.flightDate) };
  return { month: null, doy: null };
}

/** The tropopause source of a flight; for overrides and soundings a constant pressure. */
interface TropopauseSetup {
  source: TropopauseSource;
  constM: number;
  constPa: number;
  constHpa: number | null;
  soundingTp: SoundingTropopause | null;
  sounding: SoundingProfile | null;
}

function resolveTropopause(input: ScreeningInput, cautions: string[]): TropopauseSetup {
  const tp: TropopauseSetup = {
    source: 'climatology',
    constM: Number.NaN,
    constPa: Number.NaN,
    constHpa: null,
    soundingTp: null,
    sounding: null,
  };
  const tpo = input.tropopause;
  if (tpo === undefined) return tp;
  if ('altitudeM' in tpo) {
    tp.source = 'override-altitude';
    tp.constM = tpo.altitudeM;
    tp.constPa = isaPressureAt(tpo.altitudeM);
  } else if ('pressureHpa' in tpo) {
    tp.source = 'override-pressure';
    tp.constM = isaPressureAltitudeAt(tpo.pressureHpa * 100);
    tp.constPa = tpo.pressureHpa * 100;
  } else {
    tp.sounding = completeSounding(tpo.sounding, 'tropopause.sounding');
    tp.soundingTp = wmoTropopause(tp.sounding);
    if (tp.soundingTp === null) {
      cautions.push(
        'The sounding has no WMO lapse-rate tropopause above 500 hPa with 2 km of sounding above it: the climatological tropopause is used instead.',
      );
      return tp;
    }
    tp.source = 'sounding';
    tp.constPa = tp.soundingTp.pressureHpa * 100;
    tp.constM = isaPressureAltitudeAt(tp.constPa);
  }
  tp.constHpa = tp.constPa / 100;
  return tp;
}

/** The cruise levels of a flight and the steps that use them. */
interface CruisePlan {
  levels: LevelContext[];
  stepFrom: number[];
  stepLevel: number[];
}

function buildLevels(
  input: ScreeningInput,
  totalKm: number,
  sounding: SoundingProfile | null,
  inputs: OzoneInputs,
  machTiming: number,
  cautions: string[],
): CruisePlan {
  const cruise = input.cruise;
  const rawSteps = 'steps' in cruise ? cruise.steps : [{ fromKm: 0, flightLevel: cruise.flightLevel }];
  const plan: CruisePlan = { levels: [], stepFrom: [], stepLevel: [] };
  const levelByFl = new Map<number, number>();
  for (let s = 0; s < rawSteps.length; s++) {
    const st = rawSteps[s];
    if (s > 0 && st.fromKm >= totalKm) {
      cautions.push(
        `The step to FL${st.flightLevel} at ${fmt(st.fromKm)} km starts beyond the end of the route (${fmt(totalKm)} km) and was ignored.`,
      );
      continue;
    }
    let li = levelByFl.get(st.flightLevel);
    if (li === undefined) {
      li = plan.levels.length;
      levelByFl.set(st.flightLevel, li);
      const isa = isaLevel(st.flightLevel);
      let t = isa.temperatureK;
      let tSource: 'isa' | 'sounding' = 'isa';
      if (sounding !== null) {
        const ts = soundingTemperatureAtPressure(sounding, isa.pressurePa);
        if (ts === null) {
          cautions.push(`The sounding does not reach FL${st.flightLevel}: ISA temperature is used at that level.`);
        } else {
          t = ts;
          tSource = 'sounding';
        }
      }
      plan.levels.push({
        fl: st.flightLevel,
        isa,
        temperatureK: t,
        temperatureSource: tSource,
        tasMs: machTiming * isa.speedOfSoundMs,
        ei: 0,
        eiBffm2: Number.NaN,
        eiDlr: Number.NaN,
        curvePosition: 0,
        cacheable: inputs === DEFAULT_OZONE_INPUTS && tSource === 'isa' && Number.isInteger(st.flightLevel),
        coef: new Array<Float64Array | undefined>(SLOT_COUNT),
        noxBySlot: new Float64Array(SLOT_COUNT),
        noxAboveBySlot: new Float64Array(SLOT_COUNT),
        latNoxBySlot: new Float64Array(SLOT_COUNT),
        distanceKm: 0,
        fuelKg: 0,
        noxKg: 0,
        noxAboveKg: 0,
      });
    }
    plan.stepFrom.push(st.fromKm);
    plan.stepLevel.push(li);
  }
  return plan;
}

/** Fuel spread in proportion to time; time = distance / (Mach x ISA speed of sound). */
function spreadFuel(
  fuelBurnKg: number,
  totalKm: number,
  cp: CruisePlan,
  stepDurationsS: readonly number[] | null,
  stepFuelKg: readonly number[] | null = null,
): { totalTimeS: number; fuelKgPerS: number; fuelPerKm: number[]; timedTrack: boolean } {
  const n = cp.stepFrom.length;
  // A flown track with times spreads the fuel by its own times.
  const timedTrack = stepDurationsS !== null && stepDurationsS.length === n;
  const perStepFuel = timedTrack && stepFuelKg !== null && stepFuelKg.length === n ? stepFuelKg : null;
  let totalTimeS = 0;
  for (let s = 0; s < n; s++) {
    const end = s + 1 < n ? cp.stepFrom[s + 1] : totalKm;
    totalTimeS += timedTrack ? stepDurationsS[s] : ((end - cp.stepFrom[s]) * 1000) / cp.levels[cp.stepLevel[s]].tasMs;
  }
  const fuelKgPerS = fuelBurnKg / totalTimeS;
  const fuelPerKm: number[] = new Array<number>(n);
  for (let s = 0; s < n; s++) {
    const end = s + 1 < n ? cp.stepFrom[s + 1] : totalKm;
    fuelPerKm[s] = perStepFuel
      ? perStepFuel[s] / (end - cp.stepFrom[s])
      : timedTrack
        ? (fuelKgPerS * stepDurationsS[s]) / (end - cp.stepFrom[s])
        : (fuelKgPerS * 1000) / cp.levels[cp.stepLevel[s]].tasMs;
  }
  return { totalTimeS, fuelKgPerS, fuelPerKm, timedTrack };
}

/**
 * Implied cruise fuel flow per engine beyond which a fuel burn is refused: this many times the
 * engine's certified take-off fuel flow (no engine cruises there), or below this share of its idle flow.
 */
export const MAX_CRUISE_FLOW_TIMES_TAKE_OFF = 3;
export const MIN_CRUISE_FLOW_SHARE_OF_IDLE = 0.2;

function checkImpliedFuelFlow(perEngine: number, engine: { fuelFlowKgS: readonly number[] }): void {
  const idle = engine.fuelFlowKgS[0];
  const takeOff = engine.fuelFlowKgS[3];
  const far =
    perEngine > MAX_CRUISE_FLOW_TIMES_TAKE_OFF * takeOff
      ? `more than ${MAX_CRUISE_FLOW_TIMES_TAKE_OFF} times the engine's take-off fuel flow (${takeOff} kg/s)`
      : perEngine < MIN_CRUISE_FLOW_SHARE_OF_IDLE * idle
        ? `less than ${MIN_CRUISE_FLOW_SHARE_OF_IDLE} of the engine's idle fuel flow (${idle} kg/s)`
        : null;
  if (far === null) return;
  throw new ScreeningInputError([
    {
      path: 'fuelBurnKg',
      message: `This fuel burn implies ${perEngine.toPrecision(3)} kg/s per engine at cruise, ${far}: no engine cruises there. Check the fuel (kg, cruise only), the route length, the Mach number and the engine count.`,
    },
  ]);
}

/** Sets each level's EI; returns the method. Throws for a fuel flow far outside the engine's. */
function applyEmissionIndex(
  input: ScreeningInput,
  levels: LevelContext[],
  fuelKgPerS: number,
  rh: number,
  machEi: number,
  cautions: string[],
): ScreeningResult['eiMethod'] {
  const emission = input.emission;
  if ('eiNoxGPerKg' in emission) {
    for (const l of levels) l.ei = emission.eiNoxGPerKg;
    return 'direct';
  }
  const eiMethod = emission.method ?? 'bffm2';
  const perEngine = fuelKgPerS / emission.engineCount;
  checkImpliedFuelFlow(perEngine, emission.engine);
  const curveB: EiCurve = buildEiCurve(emission.engine, BFFM2_INSTALLATION_FACTORS);
  const curveD: EiCurve = buildEiCurve(emission.engine);
  const cap = SCREENING_LIMITS.maxEiNoxGPerKg;
  for (const l of levels) {
    const h =
      l.temperatureSource === 'isa' && rh === DEFAULT_OZONE_INPUTS.relativeHumidity
        ? l.isa.humidityDefault
        : humidityTerm(rh, l.isa.pressurePa, l.temperatureK);
    const c = {
      fuelFlowPerEngineKgS: perEngine,
      pressurePa: l.isa.pressurePa,
      temperatureK: l.temperatureK,
      mach: machEi,
    };
    const b = bffm2EiNox(curveB, c, h);
    const d = dlrEiNox(curveD, c, h);
    l.eiBffm2 = Math.min(cap, b.eiNoxGPerKg);
    l.eiDlr = Math.min(cap, d.eiNoxGPerKg);
    const chosen = eiMethod === 'bffm2' ? b : d;
    l.ei = eiMethod === 'bffm2' ? l.eiBffm2 : l.eiDlr;
    l.curvePosition = chosen.curvePosition;
    if (chosen.curvePosition !== 0) {
      cautions.push(
        `At FL${l.fl} the referred fuel flow (${chosen.referredFuelFlowKgS.toFixed(3)} kg/s) lies ${chosen.curvePosition > 0 ? 'above the take-off' : 'below the idle'} certification point: the correlation is valid from idle to take-off only, so the EI of that end point is held.`,
      );
    }
    if (chosen.eiNoxGPerKg > cap) {
      cautions.push(
        `At FL${l.fl} the corrected EI NOx exceeded ${cap} g/kg, the most an EI may be; it is held at ${cap} g/kg.`,
      );
    }
  }
  return eiMethod;
}

/** Running sums of the segment walk. */
interface Totals {
  noxTotal: number;
  noxAbove: number;
  depthNox: number;
  chainNox: number;
  o3Central: number;
  o3Low: number;
  o3High: number;
  slotsUsed: number;
  sun: SunSums;
}

/** Everything the segment walk reads. */
interface WalkContext {
  plan: RoutePlan;
  cp: CruisePlan;
  fuelPerKm: number[];
  tp: TropopauseSetup;
  bthRow: Float64Array;
  season: Season;
  inputs: OzoneInputs;
  fixedSlot: number;
  full: boolean;
}

const SUN_SCRATCH: WindowSunlight = {
  dayFraction: 0,
  meanCosZenith: 0,
  daytimeCosZenith: 0,
  sunlitFraction: 0,
  activeShare: 1,
};

/** Ozone loss and sunlight of one segment above the tropopause, added to the totals; returns kg O3 (central). */
function segmentOzone(
  ctx: WalkContext,
  t: Totals,
  level: LevelContext,
  slot: number,
  lat: number,
  depth: number,
  nox: number,
): number {
  const inputs = ctx.inputs;
  const c = levelCoefficients(level, slot, inputs);
  const tau = residenceTimeYears(depth, inputs.residenceTime, lat);
  const sun = windowSunlight(lat, ctx.season.doy, tau, SUN_SCRATCH);
  const s = sun.daytimeCosZenith;
  const dl = inputs.daylightFactor;
  const mol = noxMolecules(nox) * tau;
  const central = mol * lossPerNoxYear(c, 0, s, dl === null ? sun.dayFraction : dl.central);
  t.o3Central += central;
  t.o3Low += mol * lossPerNoxYear(c, 1, s, dl === null ? sun.dayFraction : dl.low);
  t.o3High += mol * lossPerNoxYear(c, 2, s, dl === null ? sun.dayFraction : dl.high);
  t.chainNox += nox * c[6] * s;
  t.sun.nox += nox;
  t.sun.dayFraction += nox * sun.dayFraction;
  t.sun.meanCos += nox * sun.meanCosZenith;
  t.sun.daytimeCos += nox * s;
  t.sun.tauYears += nox * tau;
  t.sun.sunlit += nox * sun.sunlitFraction;
  return ozoneKg(central);
}

/** Walks the route in segments of at most MAX_SEGMENT_KM, split at step starts. */
function walkSegments(ctx: WalkContext, segments: ScreeningSegment[]): Totals {
  const t: Totals = {
    noxTotal: 0,
    noxAbove: 0,
    depthNox: 0,
    chainNox: 0,
    o3Central: 0,
    o3Low: 0,
    o3High: 0,
    slotsUsed: 0,
    sun: { nox: 0, dayFraction: 0, meanCos: 0, daytimeCos: 0, tauYears: 0, sunlit: 0 },
  };
  const { plan, cp, tp, fixedSlot } = ctx;
  const climatology = tp.source === 'climatology';
  const nSteps = cp.stepFrom.length;
  const R = EARTH_RADIUS_M;
  const RAD = 180 / Math.PI;
  let step = 0;
  let nextStepKm = nSteps > 1 ? cp.stepFrom[1] : Number.POSITIVE_INFINITY;
  for (let leg = 0; leg < plan.legKm.length; leg++) {
    const legKm = plan.legKm[leg];
    if (legKm === 0) continue;
    const legStart = plan.legStartKm[leg];
    const n = Math.ceil(legKm / MAX_SEGMENT_KM);
    const piece = legKm / n;
    for (let j = 0; j < n; j++) {
      const b = j === n - 1 ? legStart + legKm : legStart + (j + 1) * piece;
      let a = legStart + j * piece;
      while (a < b) {
        const e = nextStepKm < b ? nextStepKm : b;
        if (e > a) {
          const sAng = ((0.5 * (a + e) - legStart) * 1000) / R;
          const cs = Math.cos(sAng);
          const sn = Math.sin(sAng);
          const z = plan.az[leg] * cs + plan.tz[leg] * sn;
          const lat = Math.asin(z > 1 ? 1 : z < -1 ? -1 : z) * RAD;
          const level = cp.levels[cp.stepLevel[step]];
          const bandSlot = profileSlotFor(lat, ctx.season.month);
          const slot = fixedSlot >= 0 ? fixedSlot : bandSlot;
          let tpPa = tp.constPa;
          let tpM = tp.constM;
          if (climatology) {
            tpPa = columnPressurePa(COLUMNS[bandSlot], bthHeightKm(ctx.bthRow, lat));
          }
          const above = level.isa.pressurePa < tpPa;
          if (climatology && (above || ctx.full)) tpM = isaPressureAltitudeAt(tpPa);
          const lenKm = e - a;
          const fuel = ctx.fuelPerKm[step] * lenKm;
          const nox = (fuel * level.ei) / 1000;
          let depth = 0;
          let o3 = 0;
          level.distanceKm += lenKm;
          level.fuelKg += fuel;
          level.noxKg += nox;
          level.noxBySlot[slot] += nox;
          level.latNoxBySlot[slot] += nox * lat;
          t.noxTotal += nox;
          if (above) {
            depth = (level.isa.altitudeM - tpM) / 1000;
            o3 = segmentOzone(ctx, t, level, slot, lat, depth, nox);
            t.noxAbove += nox;
            t.depthNox += nox * depth;
            level.noxAboveKg += nox;
            level.noxAboveBySlot[slot] += nox;
            t.slotsUsed |= 1 << slot;
          }
          if (ctx.full) {
            segments.push({
              startKm: a,
              endKm: e,
              lat,
              lon: Math.atan2(plan.ay[leg] * cs + plan.ty[leg] * sn, plan.ax[leg] * cs + plan.tx[leg] * sn) * RAD,
              flightLevel: level.fl,
              altitudeM: level.isa.altitudeM,
              tropopauseM: tpM,
              tropopausePressureHpa: tpPa / 100,
              tropopauseSource: tp.source,
              fuelKg: fuel,
              noxKg: nox,
              aboveTropopause: above,
              depthAboveTropopauseKm: depth,
              ozoneLossKg: o3,
            });
          }
        }
        a = e;
        if (a === nextStepKm) {
          step++;
          nextStepKm = step + 1 < nSteps ? cp.stepFrom[step + 1] : Number.POSITIVE_INFINITY;
        }
      }
    }
  }
  return t;
}

function screenCore(input: ScreeningInput, full: true, library?: RouteLibrary): ScreeningResult;
function screenCore(input: ScreeningInput, full: false, library?: RouteLibrary): ScreeningTotals;
function screenCore(
  rawInput: ScreeningInput,
  full: boolean,
  library?: RouteLibrary,
): ScreeningResult | ScreeningTotals {
  const cautions: string[] = BASE_CAUTIONS.slice();
  // A flight-plan route or a track is read into waypoints (and its levels into the cruise) first.
  const { input, flightPlan, track, stepDurationsS, stepFuelKg, coords } = expandRouteInput(rawInput, library);
  if (flightPlan !== null && full) cautions.push(...flightPlanCautions(flightPlan));
  const { lat: wLat, lon: wLon } = coords ?? resolveWaypoints(input.route.waypoints);
  const plan = planRoute(wLat, wLon, track !== null ? 'route.track.points' : undefined);
  const season = resolveSeason(input);
  const emission = input.emission;
  const machTiming = input.mach ?? ('engine' in emission ? emission.mach : undefined) ?? DEFAULT_MACH;
  const machEi = ('engine' in emission ? emission.mach : undefined) ?? input.mach ?? DEFAULT_MACH;
  const inputs = resolveOzoneInputs(input.assumptions);
  const tp = resolveTropopause(input, cautions);
  const cp = buildLevels(input, plan.totalKm, tp.sounding, inputs, machTiming, cautions);
  const fuel = spreadFuel(input.fuelBurnKg, plan.totalKm, cp, stepDurationsS, stepFuelKg);
  const eiMethod = applyEmissionIndex(input, cp.levels, fuel.fuelKgPerS, inputs.relativeHumidity, machEi, cautions);
  const op = inputs.ozoneProfile;
  const ctx: WalkContext = {
    plan,
    cp,
    fuelPerKm: fuel.fuelPerKm,
    tp,
    bthRow: bthRowForDay(season.doy),
    season,
    inputs,
    fixedSlot: op === null ? -1 : typeof op === 'string' ? OZONE_PROFILE_NAMES.indexOf(op) : CUSTOM_PROFILE_SLOT,
    full,
  };
  const segments: ScreeningSegment[] = [];
  const t = walkSegments(ctx, segments);
  const totals = summariseTotals(input, plan.totalKm, t);
  if (!full) return totals;
  const result = describeResult({
    input,
    totals,
    t,
    ctx,
    segments,
    cautions,
    wLat,
    machTiming,
    machEi,
    eiMethod,
    fuel,
  });
  if (flightPlan !== null) result.flightPlan = flightPlan;
  if (track !== null) {
    result.track = track;
    const n = track.pointsWithoutLevel;
    cautions.push(
      `The track's own levels are screened leg by leg (each leg at the mean of its two ends, to the nearest flight level), climb and descent included; ${track.fuelFromFlowKg !== null ? `the fuel (${fmt(track.fuelFromFlowKg)} kg) is its points' own fuel flows integrated over the time between them (the mean of each leg's two ends), and the mean flow sets the EI${track.enteredFuelKg !== null ? `; the entered total (${fmt(track.enteredFuelKg)} kg) is not used` : ''}` : `the fuel is spread ${fuel.timedTrack ? 'by the time between its points' : `by time at Mach ${fmt(machTiming, 2)}, as its points have no times`}`}.${n > 0 ? ` ${n} point${n === 1 ? ' has' : 's have'} no level and take${n === 1 ? 's' : ''} the entered cruise.` : ''}`,
    );
  }
  return result;
}

function flightPlanCautions(fp: FlightPlanUsed): string[] {
  const out: string[] = [];
  if (fp.unresolved.length > 0) {
    const list = fp.unresolved.map(
      (u) => `${u.item || '(empty)'}${u.position !== null ? ` at character ${u.position + 1}` : ''}: ${u.reason}`,
    );
    out.push(
      `${fp.unresolved.length} item${fp.unresolved.length === 1 ? '' : 's'} of the flight plan could not be placed and ${fp.unresolved.length === 1 ? 'is' : 'are'} left out of the route: ${list.join(' ')}`,
    );
  }
  out.push(
    fp.levelsFromText
      ? `The route and levels are those of the flight plan (${fp.waypoints.length} waypoints, ${fp.cruise.steps.length} level${fp.cruise.steps.length === 1 ? '' : 's'}); the entered cruise is not used.`
      : `The route is that of the flight plan (${fp.waypoints.length} waypoints); it gives no level, so the entered cruise is flown.`,
  );
  return out;
}

function summariseTotals(input: ScreeningInput, totalKm: number, t: Totals): ScreeningTotals {
  const noxAboveMolecules = noxMolecules(t.noxAbove);
  return {
    engineVersion: ENGINE_VERSION,
    distanceKm: totalKm,
    fuelKg: input.fuelBurnKg,
    noxTotalKg: t.noxTotal,
    noxAboveTropopauseKg: t.noxAbove,
    fractionAboveTropopause: t.noxTotal > 0 ? Math.min(1, t.noxAbove / t.noxTotal) : 0,
    meanDepthAboveTropopauseKm: t.noxAbove > 0 ? t.depthNox / t.noxAbove : 0,
    ozoneLoss: {
      centralKg: ozoneKg(t.o3Central),
      lowKg: ozoneKg(t.o3Low),
      highKg: ozoneKg(t.o3High),
      o3PerNox: noxAboveMolecules > 0 ? t.o3Central / noxAboveMolecules : 0,
      chainLength: t.noxAbove > 0 ? t.chainNox / t.noxAbove : 0,
    },
  };
}

/** O3 molecules per NOx molecule above which a caution says the inputs are likely unphysical. */
export const O3_PER_NOX_CAUTION = 1000;

/** The level and ozone slot of the local budget: most NOx above the tropopause, else the highest level. */
function budgetLevel(
  ctx: WalkContext,
  noxAbove: number,
  firstLat: number,
): { level: LevelContext; slot: number; lat: number } {
  const levels = ctx.cp.levels;
  let bLevel = levels[0];
  let bSlot = -1;
  let best = 0;
  if (noxAbove > 0) {
    for (const l of levels) {
      for (let s = 0; s < SLOT_COUNT; s++) {
        if (l.noxAboveBySlot[s] > best) {
          best = l.noxAboveBySlot[s];
          bLevel = l;
          bSlot = s;
        }
      }
    }
  } else {
    for (const l of levels) if (l.fl > bLevel.fl) bLevel = l;
    for (let s = 0; s < SLOT_COUNT; s++) {
      if (bLevel.noxBySlot[s] > best) {
        best = bLevel.noxBySlot[s];
        bSlot = s;
      }
    }
  }
  if (bSlot < 0)
    return {
      level: bLevel,
      slot: ctx.fixedSlot >= 0 ? ctx.fixedSlot : profileSlotFor(firstLat, ctx.season.month),
      lat: firstLat,
    };
  const bNox = bLevel.noxBySlot[bSlot];
  return { level: bLevel, slot: bSlot, lat: bNox > 0 ? bLevel.latNoxBySlot[bSlot] / bNox : firstLat };
}

/** The method lines of a result, each naming its source. */
function methodLines(
  input: ScreeningInput,
  ctx: WalkContext,
  eiMethod: ScreeningResult['eiMethod'],
  machTiming: number,
  machEi: number,
  fuelKgPerS: number,
): string[] {
  const emission = input.emission;
  const tp = ctx.tp;
  const inputs = ctx.inputs;
  const season = ctx.season;
  const climatology = tp.source === 'climatology';
  return [
    `The entered fuel (${fmt(input.fuelBurnKg)} kg) is the cruise fuel along the entered track, spread over the segments in proportion to time; time = distance / true airspeed, true airspeed = Mach ${fmt(machTiming, 2)} x ISA speed of sound at each level. Climb and descent are not modelled.`,
    `Great circles by geolib on the mean Earth sphere (radius ${EARTH_RADIUS_M} m), split into segments of at most ${MAX_SEGMENT_KM} km; each segment is evaluated at its midpoint.`,
    'Flight levels are ISA pressure altitudes (FL x 30.48 m, ICAO Doc 7488/3); aircraft and tropopause are compared in pressure, and the tropopause is reported as an ISA pressure altitude and a pressure.',
    TROPOPAUSE_SOURCE_TEXT[tp.source] +
      (climatology
        ? input.month !== undefined
          ? ` Month ${season.month} (mid-month day ${season.doy}).`
          : input.flightDate !== undefined
            ? ` Day of year ${season.doy} of ${input.flightDate}.`
            : ' No month or date: annual mean of the 12 mid-month rows.'
        : ''),
    'eiNoxGPerKg' in emission
      ? `EI NOx ${emission.eiNoxGPerKg} g/kg as entered, the same at every level.`
      : `EI NOx from engine certification data by ${eiMethod === 'bffm2' ? 'Boeing Fuel Flow Method 2 (DuBois & Paynter 2006, SAE 2006-01-1987)' : 'the DLR fuel-flow method (Deidewig, Doepelheuer & Lecht 1996)'}, the other method shown beside it; cruise fuel flow per engine ${(fuelKgPerS / ('engineCount' in emission ? emission.engineCount : 1)).toFixed(3)} kg/s; Mach ${fmt(machEi, 2)}; humidity term -19.0 (omega - 0.0063) with omega the humidity ratio at relative humidity ${inputs.relativeHumidity} (Goff-Gratch saturation pressure); the log-log curve is valid from idle to take-off and its end EI is held beyond them; at most ${SCREENING_LIMITS.maxEiNoxGPerKg} g/kg.`,
    `Temperature for the EI correction from ${tp.sounding !== null ? 'the sounding where it covers the level, else ISA' : 'ISA'}; temperature, air density and ozone for the chemistry at the flight level's height in the climatological column (${AFGL_COLUMN_SOURCE})${tp.sounding !== null ? ', with the sounding temperature where it covers the level' : ''}. NOx is NO2-equivalent mass; N mass = 0.30446 x NO2 mass; CO2 = 3.16 kg per kg fuel (ICAO CORSIA).`,
    `Sunlight: ${SUN_SOURCE}; the overhead-sun J values are scaled by the daytime-mean cos zenith and the loss by the sunlit fraction of the day times the active NOx share.`,
  ];
}

function describeResult(args: {
  input: ScreeningInput;
  totals: ScreeningTotals;
  t: Totals;
  ctx: WalkContext;
  segments: ScreeningSegment[];
  cautions: string[];
  wLat: Float64Array;
  machTiming: number;
  machEi: number;
  eiMethod: ScreeningResult['eiMethod'];
  fuel: { totalTimeS: number; fuelKgPerS: number };
}): ScreeningResult {
  const { input, totals, t, ctx, segments, cautions, eiMethod } = args;
  const inputs = ctx.inputs;
  const levels = ctx.cp.levels;
  const tp = ctx.tp;
  const direct = eiMethod === 'direct';
  const b = budgetLevel(ctx, t.noxAbove, args.wLat[0]);
  const st = chemistryState(b.level, b.slot);
  const budgetSun =
    t.sun.nox > 0 ? t.sun.daytimeCos / t.sun.nox : windowSunlight(b.lat, ctx.season.doy, 0.25).daytimeCosZenith;
  const customProfile =
    typeof inputs.ozoneProfile === 'object' && inputs.ozoneProfile !== null ? inputs.ozoneProfile : undefined;
  const localBudget = oddOxygenBudget({
    altitudeM: b.level.isa.altitudeM,
    latitudeDeg: b.lat,
    profileSlot: b.slot,
    aboveTropopause: t.noxAbove > 0,
    temperatureK: st.t,
    airDensityCm3: st.m,
    o3Ppmv: ozonePpmv(b.slot, st.zKm, customProfile),
    inputs,
    sunCos: budgetSun,
  });
  const fleetStudies = fleetOzoneColumnContext(
    levels.map((l) => ({ geometricAltitudeKm: l.isa.geometricKm, noxKgPerYear: l.noxAboveKg * 365 })),
  );
  let fuelB = 0;
  let fuelBN = 0;
  let fuelDN = 0;
  const levelRows: ScreeningLevel[] = levels.map((l) => {
    if (!direct) {
      fuelB += l.fuelKg;
      fuelBN += l.fuelKg * l.eiBffm2;
      fuelDN += l.fuelKg * l.eiDlr;
    }
    return {
      flightLevel: l.fl,
      altitudeM: l.isa.altitudeM,
      pressureHpa: l.isa.pressurePa / 100,
      temperatureK: l.temperatureK,
      temperatureSource: l.temperatureSource,
      trueAirspeedMs: l.tasMs,
      distanceKm: l.distanceKm,
      fuelKg: l.fuelKg,
      noxKg: l.noxKg,
      noxAboveTropopauseKg: l.noxAboveKg,
      eiNoxGPerKg: l.ei,
      eiBffm2GPerKg: direct ? null : l.eiBffm2,
      eiDlrGPerKg: direct ? null : l.eiDlr,
    };
  });
  if (t.noxAbove === 0) {
    cautions.push(
      'No NOx is emitted above the tropopause on this flight, so the ozone-loss figure is zero by construction.',
    );
  }
  if (totals.ozoneLoss.o3PerNox > O3_PER_NOX_CAUTION) {
    cautions.push(
      `The figure implies ${fmt(totals.ozoneLoss.o3PerNox)} O3 molecules destroyed per NOx molecule, above about ${O3_PER_NOX_CAUTION}: check the residence times, J values and NOx/NOy share given with the flight.`,
    );
  }
  const machTiming = args.machTiming;
  if (machTiming > 1 || args.machEi > 1) {
    cautions.push(
      direct
        ? `Mach ${fmt(Math.max(machTiming, args.machEi), 2)}: the EI NOx is used as entered; fuel-flow correlations are calibrated on subsonic engines, so a measured cruise EI is the right input here.`
        : `Mach ${fmt(Math.max(machTiming, args.machEi), 2)}: fuel-flow correlations (BFFM2, DLR) are calibrated on subsonic engines; prefer a measured cruise EI for supersonic cruise.`,
    );
  }
  const climatology = tp.source === 'climatology';
  const season = ctx.season;
  const assumptions = methodLines(input, ctx, eiMethod, machTiming, args.machEi, args.fuel.fuelKgPerS);
  const fuelKg = input.fuelBurnKg;
  const result: ScreeningResult = {
    engineVersion: ENGINE_VERSION,
    distanceKm: totals.distanceKm,
    fuelKg,
    co2Kg: fuelKg * CO2_PER_KG_FUEL,
    cruiseTimeH: args.fuel.totalTimeS / 3600,
    noxTotalKg: totals.noxTotalKg,
    noxAboveTropopauseKg: totals.noxAboveTropopauseKg,
    noxAboveTropopauseKgN: (totals.noxAboveTropopauseKg * MOLAR_MASS_N) / MOLAR_MASS_NO2,
    fractionAboveTropopause: totals.fractionAboveTropopause,
    meanDepthAboveTropopauseKm: totals.meanDepthAboveTropopauseKm,
    eiMethod,
    meanCruiseEiNoxGPerKg: (totals.noxTotalKg * 1000) / fuelKg,
    month: season.month,
    dayOfYear: season.doy,
    tropopause: {
      source: tp.source,
      description: TROPOPAUSE_SOURCE_TEXT[tp.source],
      altitudeM: climatology ? null : tp.constM,
      pressureHpa: climatology ? null : tp.constHpa,
      sounding: tp.soundingTp,
    },
    tropopauseSource: tp.source,
    levels: levelRows,
    ozoneLoss: {
      ...totals.ozoneLoss,
      assumptions: describeAssumptions(input.assumptions, inputs, t.slotsUsed, t.sun),
      localBudget,
      fleetContext: {
        basis:
          'This flight repeated daily for a year (NOx above the tropopause x 365), scaled on published fleet-scale model results.',
        studies: fleetStudies,
      },
      note: OZONE_NOTE,
    },
    segments,
    cautions,
    assumptions,
  };
  if (!direct) result.eiComparison = { bffm2: fuelB > 0 ? fuelBN / fuelB : 0, dlr: fuelB > 0 ? fuelDN / fuelB : 0 };
  return result;
}

/**
 * Screens one flight (the public engine contract). `input` is validated with
 * `screeningInputSchema`; every bad field throws ScreeningInputError with its dotted path. Result
 * units: km, kg (NOx as NO2), geopotential m, g/kg.
 */
export function screenFlight(input: unknown): ScreeningResult {
  return screenValidated(validateScreeningInput(input));
}
