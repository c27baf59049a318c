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
import {
  BFFM2_INSTALLATION_FACTORS,
  bffm2EiNox,
  buildEiCurve,
  dlrEiNox,
  humidityTerm,
  type CurvePosition,
} from './emission-index';
import {
  AFGL_SOURCE,
  CUSTOM_PROFILE_SLOT,
  DEFAULT_OZONE_INPUTS,
  MOLAR_MASS_N,
  MOLAR_MASS_NO2,
  PROFILE_SLOTS,
  airNumberDensityCm3,
  fleetOzoneColumnContext,
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
import { EARTH_RADIUS_M, MAX_SEGMENT_KM, planRoute, resolveWaypoints } from './route';
import type { FlightPlanUsed, RouteLibrary } from './flight-plan';
import { expandRouteInput } from './route-input';
import type { TrackUsed } from './track';
import {
  MID_MONTH_DAY_OF_YEAR,
  completeSounding,
  mateusSeasonalKm,
  mateusTropopauseM,
  soundingTemperatureAtPressure,
  wmoTropopause,
  type SoundingTropopause,
} from './tropopause';
import { validateScreeningInput } from './validate';
import { OZONE_PROFILE_NAMES, type ScreeningInput } from '../validation/screening';

/** Version of the methods; saved results carry it so they can be told apart and recomputed. */
export const ENGINE_VERSION = '2026.12.2';

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
  /** Tropopause as ISA pressure altitude, m (comparisons are made in pressure). */
  tropopauseM: number;
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
  daylightFactor: Band & { source: string };
  noxToNoyFraction: Band & { source: string };
  residenceTime: {
    depthKm: readonly number[];
    years: readonly number[];
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
  /** Gross catalytic O3 destroyed, kg: central, low and high (all inputs low / high together). */
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
  airDensityCm3: number;
  geometricKm: number;
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
    airDensityCm3: airNumberDensityCm3(p, t),
    geometricKm: geometricFromGeopotentialM(h) / 1000,
    humidityDefault: humidityTerm(DEFAULT_OZONE_INPUTS.relativeHumidity, p, t),
  };
  if (cacheable) ISA_LEVEL_CACHE[fl] = lvl;
  return lvl;
}

interface LevelContext {
  fl: number;
  isa: IsaLevel;
  temperatureK: number;
  temperatureSource: 'isa' | 'sounding';
  airDensityCm3: number;
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

function levelCoefficients(level: LevelContext, slot: number, inputs: OzoneInputs): Float64Array {
  const own = level.coef[slot];
  if (own !== undefined) return own;
  let c: Float64Array | undefined;
  const key = level.fl * SLOT_COUNT + slot;
  if (level.cacheable) c = DEFAULT_COEF_CACHE[key];
  if (c === undefined) {
    c = new Float64Array(4);
    const custom = typeof inputs.ozoneProfile === 'object' && inputs.ozoneProfile !== null ? inputs.ozoneProfile : undefined;
    ozoneLossCoefficients(level.temperatureK, level.airDensityCm3, ozonePpmv(slot, level.isa.geometricKm, custom), inputs, c);
    if (level.cacheable) DEFAULT_COEF_CACHE[key] = c;
  }
  level.coef[slot] = c;
  return c;
}

const TROPOPAUSE_SOURCE_TEXT: Record<TropopauseSource, string> = {
  climatology:
    'Climatological tropopause by latitude and season: Mateus, Mendes & Pires (2022), Remote Sensing 14, 4303, 3.5 PVU blend (RMSE about 0.9 km), geometric height converted to geopotential.',
  'override-altitude': 'Tropopause altitude given with the flight (taken as ISA pressure altitude).',
  'override-pressure': 'Tropopause pressure given with the flight, converted to ISA pressure altitude.',
  sounding: 'WMO (1957) lapse-rate tropopause of the sounding given with the flight, compared in pressure.',
};

const BASE_CAUTIONS: readonly string[] = Object.freeze([
  'Screening estimate for planning and reporting support: not a certified emissions inventory and not a regulatory method.',
  'The ozone figure is a gross catalytic loss by the added NOx, not a net change of the ozone column: halogen and aerosol chemistry buffer it, and below about 13-20 km the same NOx also makes ozone (HO2 + NO), so there the net effect is likely ozone production.',
  "Follow the operator's approved methods and the applicable regulation; these figures do not replace them.",
]);

const OZONE_NOTE =
  'Gross catalytic odd-oxygen destruction by the NOx emitted above the tropopause, not a net column change; below about 13-20 km the NOx also produces ozone.';

const SOURCE_DEFAULT = 'default: screening value of the right order of magnitude, given from memory; override it with a published value where one is adopted';
const SOURCE_INPUT = 'given with the flight';

function describeBand(v: unknown, b: Band): Band & { source: string } {
  return { central: b.central, low: b.low, high: b.high, source: v === undefined ? SOURCE_DEFAULT : SOURCE_INPUT };
}

const FORMULA =
  'O3 destroyed = N_NOx x 2 k(NO2+O)(T) [O] x D x f_NO2 x f_NOx/NOy x tau(depth); [O] = [O3] J(O3) / (k(O+O2+M) [O2] [M]); f_NO2 from [NO2]/[NO] = k(NO+O3)[O3] / (J(NO2) + k(NO2+O)[O]).';
const BAND_TEXT =
  'Low: J(O3), D, f_NOx/NOy and residence time low together, J(NO2) high; high: the reverse. A deliberately wide screening band.';
const TAU_TEXT =
  'Linear in depth between nodes at the lower edge of each depth band, flat beyond the last node (conservative: never below a band value inside the band).';
const TAU_SOURCE =
  'default: IPCC 1999 "Aviation and the Global Atmosphere" ch. 2 and 4 picture (weeks to months just above the extratropical tropopause, 1-2 years at 16-20 km), values from memory';

function describeAssumptions(a: ScreeningInput['assumptions'], inputs: OzoneInputs, slotsUsed: number): OzoneAssumptionsUsed {
  const profilesUsed: ProfileSlotName[] = [];
  for (let s = 0; s < SLOT_COUNT; s++) if (slotsUsed & (1 << s)) profilesUsed.push(PROFILE_SLOTS[s]);
  const p = inputs.ozoneProfile;
  const choice =
    p === null
      ? 'AFGL profile by latitude band (tropical |lat| < 23.5, mid-latitude 23.5-50, subarctic > 50) and season (summer April-September in the north, October-March in the south; annual mean of summer and winter without a month)'
      : typeof p === 'string'
        ? `AFGL ${p} profile for every segment (given with the flight)`
        : 'Ozone profile given with the flight';
  return {
    ozoneProfile: { choice, profilesUsed, source: p !== null && typeof p === 'object' ? SOURCE_INPUT : AFGL_SOURCE },
    jO3NoonPerS: describeBand(a?.jO3NoonPerS, inputs.jO3NoonPerS),
    jNo2NoonPerS: describeBand(a?.jNo2NoonPerS, inputs.jNo2NoonPerS),
    daylightFactor: describeBand(a?.daylightFactor, inputs.daylightFactor),
    noxToNoyFraction: describeBand(a?.noxToNoyFraction, inputs.noxToNoyFraction),
    residenceTime: {
      depthKm: inputs.residenceTime.depthKm,
      years: inputs.residenceTime.years,
      lowFactor: inputs.residenceTime.lowFactor,
      highFactor: inputs.residenceTime.highFactor,
      interpolation: TAU_TEXT,
      source: a?.residenceTime === undefined ? TAU_SOURCE : SOURCE_INPUT,
    },
    ohCm3: { value: inputs.ohCm3, source: a?.ohCm3 === undefined ? `${SOURCE_DEFAULT}; daytime, for the chain length` : SOURCE_INPUT },
    ho2Cm3: {
      value: inputs.ho2Cm3,
      source: a?.ho2Cm3 === undefined ? 'default: 5 x [OH], lower-stratosphere daytime ratio from memory; local budget only' : SOURCE_INPUT,
    },
    rateConstants: 'JPL Publication 19-5 (Burkholder et al. 2019); NO2 + O in the JPL 15-10 bimolecular form',
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
 * what the schema cannot know: unknown airports, a route with no length or antipodal legs, and a
 * sounding whose levels contradict each other.
 */
export function screenValidated(input: ScreeningInput, library?: RouteLibrary): ScreeningResult {
  return screenCore(input, true, library);
}

/** As `screenValidated`, returning only the totals: no segments, texts, local budget or fleet context. */
export function screenTotals(input: ScreeningInput, library?: RouteLibrary): ScreeningTotals {
  return screenCore(input, false, library);
}

function screenCore(input: ScreeningInput, full: true, library?: RouteLibrary): ScreeningResult;
function screenCore(input: ScreeningInput, full: false, library?: RouteLibrary): ScreeningTotals;
function screenCore(rawInput: ScreeningInput, full: boolean, library?: RouteLibrary): ScreeningResult | ScreeningTotals {
  const cautions: string[] = BASE_CAUTIONS.slice();
  // A flight-plan route is read into waypoints (and its levels into the cruise) before anything else.
  const { input, flightPlan, track, stepDurationsS } = expandRouteInput(rawInput, library);
  if (flightPlan !== null && full) cautions.push(...flightPlanCautions(flightPlan));
  const { lat: wLat, lon: wLon } = resolveWaypoints(input.route.waypoints);
  const plan = planRoute(wLat, wLon, track !== null ? 'route.track.points' : undefined);
  const totalKm = plan.totalKm;

  // Season: month wins over flight date; neither gives the annual mean.
  let month: number | null = null;
  let doy: number | null = null;
  if (input.month !== undefined) {
    month = input.month;
    doy = MID_MONTH_DAY_OF_YEAR[month - 1];
  } else if (input.flightDate !== undefined) {
    month = Number(input.flightDate.slice(5, 7));
    doy = dayOfYear(input.flightDate);
  }
  const seasonalN = mateusSeasonalKm(true, doy);
  const seasonalS = mateusSeasonalKm(false, doy);

  const emission = input.emission;
  const machTiming = input.mach ?? ('engine' in emission ? emission.mach : undefined) ?? DEFAULT_MACH;
  const machEi = ('engine' in emission ? emission.mach : undefined) ?? input.mach ?? DEFAULT_MACH;
  const inputs = resolveOzoneInputs(input.assumptions);
  const rh = inputs.relativeHumidity;

  // Tropopause source and, with a sounding, its temperatures.
  let tpSource: TropopauseSource = 'climatology';
  let tpConstM = Number.NaN;
  let tpConstHpa: number | null = null;
  let soundingTp: SoundingTropopause | null = null;
  let sounding: ReturnType<typeof completeSounding> | null = null;
  const tpo = input.tropopause;
  if (tpo !== undefined) {
    if ('altitudeM' in tpo) {
      tpSource = 'override-altitude';
      tpConstM = tpo.altitudeM;
      tpConstHpa = isaPressureAt(tpConstM) / 100;
    } else if ('pressureHpa' in tpo) {
      tpSource = 'override-pressure';
      tpConstM = isaPressureAltitudeAt(tpo.pressureHpa * 100);
      tpConstHpa = tpo.pressureHpa;
    } else {
      sounding = completeSounding(tpo.sounding, 'tropopause.sounding');
      soundingTp = wmoTropopause(sounding);
      if (soundingTp === null) {
        cautions.push('The sounding has no WMO lapse-rate tropopause above 500 hPa: the climatological tropopause is used instead.');
      } else {
        tpSource = 'sounding';
        tpConstM = isaPressureAltitudeAt(soundingTp.pressureHpa * 100);
        tpConstHpa = soundingTp.pressureHpa;
      }
    }
  }
  const climatology = tpSource === 'climatology';

  // Cruise steps that start on the route.
  const cruise = input.cruise;
  const rawSteps = 'steps' in cruise ? cruise.steps : [{ fromKm: 0, flightLevel: cruise.flightLevel }];
  const stepFrom: number[] = [];
  const stepLevel: number[] = [];
  const levels: LevelContext[] = [];
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
      li = levels.length;
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
      levels.push({
        fl: st.flightLevel,
        isa,
        temperatureK: t,
        temperatureSource: tSource,
        airDensityCm3: tSource === 'isa' ? isa.airDensityCm3 : airNumberDensityCm3(isa.pressurePa, t),
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
    stepFrom.push(st.fromKm);
    stepLevel.push(li);
  }
  const nSteps = stepFrom.length;

  // Fuel spread in proportion to time: a track's own times, else distance / (Mach x ISA speed of sound).
  const timedTrack = stepDurationsS !== null && stepDurationsS.length === nSteps;
  let totalTimeS = 0;
  for (let s = 0; s < nSteps; s++) {
    const end = s + 1 < nSteps ? stepFrom[s + 1] : totalKm;
    totalTimeS += timedTrack ? stepDurationsS[s] : ((end - stepFrom[s]) * 1000) / levels[stepLevel[s]].tasMs;
  }
  const fuelKgPerS = input.fuelBurnKg / totalTimeS;
  const fuelPerKm: number[] = new Array<number>(nSteps);
  for (let s = 0; s < nSteps; s++) {
    const end = s + 1 < nSteps ? stepFrom[s + 1] : totalKm;
    fuelPerKm[s] = timedTrack ? (fuelKgPerS * stepDurationsS[s]) / (end - stepFrom[s]) : (fuelKgPerS * 1000) / levels[stepLevel[s]].tasMs;
  }

  // Emission index per level.
  let eiMethod: ScreeningResult['eiMethod'] = 'direct';
  const direct = 'eiNoxGPerKg' in emission;
  if ('eiNoxGPerKg' in emission) {
    for (const l of levels) l.ei = emission.eiNoxGPerKg;
  } else {
    eiMethod = emission.method ?? 'bffm2';
    const curveB = buildEiCurve(emission.engine, BFFM2_INSTALLATION_FACTORS);
    const curveD = buildEiCurve(emission.engine);
    const perEngine = fuelKgPerS / emission.engineCount;
    for (const l of levels) {
      const h = l.temperatureSource === 'isa' && rh === DEFAULT_OZONE_INPUTS.relativeHumidity
        ? l.isa.humidityDefault
        : humidityTerm(rh, l.isa.pressurePa, l.temperatureK);
      const c = { fuelFlowPerEngineKgS: perEngine, pressurePa: l.isa.pressurePa, temperatureK: l.temperatureK, mach: machEi };
      const b = bffm2EiNox(curveB, c, h);
      const d = dlrEiNox(curveD, c, h);
      l.eiBffm2 = b.eiNoxGPerKg;
      l.eiDlr = d.eiNoxGPerKg;
      const chosen = eiMethod === 'bffm2' ? b : d;
      l.ei = chosen.eiNoxGPerKg;
      l.curvePosition = chosen.curvePosition;
      if (chosen.curvePosition !== 0) {
        cautions.push(
          `At FL${l.fl} the referred fuel flow (${chosen.referredFuelFlowKgS.toFixed(3)} kg/s) lies ${chosen.curvePosition > 0 ? 'above the take-off' : 'below the idle'} certification point: the EI curve is extended as a power law beyond the certified range.`,
        );
      }
    }
  }
  if (machTiming > 1 || machEi > 1) {
    cautions.push(
      direct
        ? `Mach ${fmt(Math.max(machTiming, machEi), 2)}: the EI NOx is used as entered; fuel-flow correlations are calibrated on subsonic engines, so a measured cruise EI is the right input here.`
        : `Mach ${fmt(Math.max(machTiming, machEi), 2)}: fuel-flow correlations (BFFM2, DLR) are calibrated on subsonic engines; prefer a measured cruise EI for supersonic cruise.`,
    );
  }

  // Ozone profile: fixed by the user, or by band and season per segment.
  const op = inputs.ozoneProfile;
  const fixedSlot = op === null ? -1 : typeof op === 'string' ? OZONE_PROFILE_NAMES.indexOf(op) : CUSTOM_PROFILE_SLOT;
  const rt = inputs.residenceTime;

  // Segments.
  const segments: ScreeningSegment[] = [];
  const R = EARTH_RADIUS_M;
  const RAD = 180 / Math.PI;
  let step = 0;
  let nextStepKm = nSteps > 1 ? stepFrom[1] : Number.POSITIVE_INFINITY;
  let noxTotal = 0;
  let noxAbove = 0;
  let depthNox = 0;
  let chainNox = 0;
  let o3Central = 0;
  let o3Low = 0;
  let o3High = 0;
  let slotsUsed = 0;
  for (let leg = 0; leg < plan.legKm.length; leg++) {
    const legKm = plan.legKm[leg];
    if (legKm === 0) continue;
    const legStart = plan.legStartKm[leg];
    const n = Math.ceil(legKm / MAX_SEGMENT_KM);
    const piece = legKm / n;
    const ax = plan.ax[leg];
    const ay = plan.ay[leg];
    const az = plan.az[leg];
    const tx = plan.tx[leg];
    const ty = plan.ty[leg];
    const tz = plan.tz[leg];
    for (let j = 0; j < n; j++) {
      const b = j === n - 1 ? legStart + legKm : legStart + (j + 1) * piece;
      let a = legStart + j * piece;
      while (a < b) {
        const e = nextStepKm < b ? nextStepKm : b;
        if (e > a) {
          const mid = 0.5 * (a + e) - legStart;
          const sAng = (mid * 1000) / R;
          const cs = Math.cos(sAng);
          const sn = Math.sin(sAng);
          const z = az * cs + tz * sn;
          const lat = Math.asin(z > 1 ? 1 : z < -1 ? -1 : z) * RAD;
          const lon = Math.atan2(ay * cs + ty * sn, ax * cs + tx * sn) * RAD;
          const tpM = climatology ? mateusTropopauseM(lat, seasonalN, seasonalS) : tpConstM;
          const level = levels[stepLevel[step]];
          const alt = level.isa.altitudeM;
          const lenKm = e - a;
          const fuel = fuelPerKm[step] * lenKm;
          const nox = (fuel * level.ei) / 1000;
          const above = alt > tpM;
          const slot = fixedSlot >= 0 ? fixedSlot : profileSlotFor(lat, month);
          let depth = 0;
          let o3 = 0;
          level.distanceKm += lenKm;
          level.fuelKg += fuel;
          level.noxKg += nox;
          level.noxBySlot[slot] += nox;
          level.latNoxBySlot[slot] += nox * lat;
          noxTotal += nox;
          if (above) {
            depth = (alt - tpM) / 1000;
            const c = levelCoefficients(level, slot, inputs);
            const tau = residenceTimeYears(depth, rt);
            const mol = noxMolecules(nox) * tau;
            const central = mol * c[0];
            o3Central += central;
            o3Low += mol * c[1];
            o3High += mol * c[2];
            o3 = ozoneKg(central);
            chainNox += nox * c[3];
            noxAbove += nox;
            depthNox += nox * depth;
            level.noxAboveKg += nox;
            level.noxAboveBySlot[slot] += nox;
            slotsUsed |= 1 << slot;
          }
          if (full) segments.push({
            startKm: a,
            endKm: e,
            lat,
            lon,
            flightLevel: level.fl,
            altitudeM: alt,
            tropopauseM: tpM,
            tropopauseSource: tpSource,
            fuelKg: fuel,
            noxKg: nox,
            aboveTropopause: above,
            depthAboveTropopauseKm: depth,
            ozoneLossKg: o3,
          });
        }
        a = e;
        if (a === nextStepKm) {
          step++;
          nextStepKm = step + 1 < nSteps ? stepFrom[step + 1] : Number.POSITIVE_INFINITY;
        }
      }
    }
  }

  const noxAboveMolecules = noxMolecules(noxAbove);
  const ozoneFigures: ScreeningTotals['ozoneLoss'] = {
    centralKg: ozoneKg(o3Central),
    lowKg: ozoneKg(o3Low),
    highKg: ozoneKg(o3High),
    o3PerNox: noxAboveMolecules > 0 ? o3Central / noxAboveMolecules : 0,
    chainLength: noxAbove > 0 ? chainNox / noxAbove : 0,
  };
  const fractionAbove = noxTotal > 0 ? Math.min(1, noxAbove / noxTotal) : 0;
  const meanDepth = noxAbove > 0 ? depthNox / noxAbove : 0;
  if (!full) {
    return {
      engineVersion: ENGINE_VERSION,
      distanceKm: totalKm,
      fuelKg: input.fuelBurnKg,
      noxTotalKg: noxTotal,
      noxAboveTropopauseKg: noxAbove,
      fractionAboveTropopause: fractionAbove,
      meanDepthAboveTropopauseKm: meanDepth,
      ozoneLoss: ozoneFigures,
    };
  }

  // Local budget at the level and profile carrying the most NOx above the tropopause (else the
  // highest level and its main profile).
  let bLevel = levels[0];
  let bSlot = 0;
  let best = -1;
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
  const bNox = bLevel.noxBySlot[bSlot];
  const bLat = bNox > 0 ? bLevel.latNoxBySlot[bSlot] / bNox : wLat[0];
  const customProfile = typeof op === 'object' && op !== null ? op : undefined;
  const localBudget = oddOxygenBudget({
    altitudeM: bLevel.isa.altitudeM,
    latitudeDeg: bLat,
    profileSlot: bSlot,
    aboveTropopause: noxAbove > 0,
    temperatureK: bLevel.temperatureK,
    airDensityCm3: bLevel.airDensityCm3,
    o3Ppmv: ozonePpmv(bSlot, bLevel.isa.geometricKm, customProfile),
    inputs,
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

  if (noxAbove === 0) {
    cautions.push('No NOx is emitted above the tropopause on this flight, so the ozone-loss figure is zero by construction.');
  }

  const assumptions: string[] = [
    `The entered fuel (${fmt(input.fuelBurnKg)} kg) is the cruise fuel along the entered track, spread over the segments in proportion to time; time = distance / true airspeed, true airspeed = Mach ${fmt(machTiming, 2)} x ISA speed of sound at each level. Climb and descent are not modelled.`,
    `Great circles by geolib on the mean Earth sphere (radius ${R} m), split into segments of at most ${MAX_SEGMENT_KM} km; each segment is evaluated at its midpoint.`,
    'Flight levels are ISA pressure altitudes (FL x 30.48 m); aircraft and tropopause are compared in pressure through the ICAO standard atmosphere (ICAO Doc 7488/3).',
    TROPOPAUSE_SOURCE_TEXT[tpSource] +
      (climatology ? (input.month !== undefined ? ` Month ${month} (mid-month day ${doy}).` : input.flightDate !== undefined ? ` Day of year ${doy} of ${input.flightDate}.` : ' No month or date: annual mean.') : ''),
    direct
      ? `EI NOx ${emission.eiNoxGPerKg} g/kg as entered, the same at every level.`
      : `EI NOx from engine certification data by ${eiMethod === 'bffm2' ? 'Boeing Fuel Flow Method 2 (DuBois & Paynter 2006)' : 'the DLR fuel-flow method (Deidewig et al. 1996)'}, the other method shown beside it; cruise fuel flow per engine ${(fuelKgPerS / ('engineCount' in emission ? emission.engineCount : 1)).toFixed(3)} kg/s; Mach ${fmt(machEi, 2)}; relative humidity ${rh} with Goff-Gratch saturation pressure; log-log curve extended as a power law beyond the four certification points.`,
    `Ambient temperature from ${sounding !== null ? 'the sounding where it covers the level, else ISA' : 'ISA'}; NOx is NO2-equivalent mass; N mass = 0.30446 x NO2 mass; CO2 = 3.16 kg per kg fuel (ICAO CORSIA).`,
  ];

  const fuelKg = input.fuelBurnKg;
  const result: ScreeningResult = {
    engineVersion: ENGINE_VERSION,
    distanceKm: totalKm,
    fuelKg,
    co2Kg: fuelKg * CO2_PER_KG_FUEL,
    cruiseTimeH: totalTimeS / 3600,
    noxTotalKg: noxTotal,
    noxAboveTropopauseKg: noxAbove,
    noxAboveTropopauseKgN: (noxAbove * MOLAR_MASS_N) / MOLAR_MASS_NO2,
    fractionAboveTropopause: fractionAbove,
    meanDepthAboveTropopauseKm: meanDepth,
    eiMethod,
    meanCruiseEiNoxGPerKg: (noxTotal * 1000) / fuelKg,
    month,
    dayOfYear: doy,
    tropopause: {
      source: tpSource,
      description: TROPOPAUSE_SOURCE_TEXT[tpSource],
      altitudeM: climatology ? null : tpConstM,
      pressureHpa: climatology ? null : tpConstHpa,
      sounding: soundingTp,
    },
    tropopauseSource: tpSource,
    levels: levelRows,
    ozoneLoss: {
      ...ozoneFigures,
      assumptions: describeAssumptions(input.assumptions, inputs, slotsUsed),
      localBudget,
      fleetContext: {
        basis: 'This flight repeated daily for a year (NOx above the tropopause x 365), scaled on published fleet-scale model results.',
        studies: fleetStudies,
      },
      note: OZONE_NOTE,
    },
    segments,
    cautions,
    assumptions,
  };
  if (flightPlan !== null) result.flightPlan = flightPlan;
  if (track !== null) {
    result.track = track;
    cautions.push(
      `The track's own levels are screened leg by leg (each leg at the mean of its two ends, to the nearest flight level), climb and descent included; the fuel is spread ${timedTrack ? 'by the time between its points' : `by time at Mach ${fmt(machTiming, 2)}, as its points have no times`}.${track.pointsWithoutLevel > 0 ? ` ${track.pointsWithoutLevel} point${track.pointsWithoutLevel === 1 ? ' has' : 's have'} no level and take${track.pointsWithoutLevel === 1 ? 's' : ''} the entered cruise.` : ''}`,
    );
  }
  if (!direct) result.eiComparison = { bffm2: fuelB > 0 ? fuelBN / fuelB : 0, dlr: fuelB > 0 ? fuelDN / fuelB : 0 };
  return result;
}

function flightPlanCautions(fp: FlightPlanUsed): string[] {
  const out: string[] = [];
  if (fp.unresolved.length > 0) {
    const list = fp.unresolved.map((u) => `${u.item || '(empty)'}${u.position !== null ? ` at character ${u.position + 1}` : ''}: ${u.reason}`);
    out.push(`${fp.unresolved.length} item${fp.unresolved.length === 1 ? '' : 's'} of the flight plan could not be placed and ${fp.unresolved.length === 1 ? 'is' : 'are'} left out of the route: ${list.join(' ')}`);
  }
  out.push(
    fp.levelsFromText
      ? `The route and levels are those of the flight plan (${fp.waypoints.length} waypoints, ${fp.cruise.steps.length} level${fp.cruise.steps.length === 1 ? '' : 's'}); the entered cruise is not used.`
      : `The route is that of the flight plan (${fp.waypoints.length} waypoints); it gives no level, so the entered cruise is flown.`,
  );
  return out;
}

/**
 * Screens one flight (the public engine contract). `input` is validated with
 * `screeningInputSchema`; every bad field throws ScreeningInputError with its dotted path. Result
 * units: km, kg (NOx as NO2), geopotential m, g/kg.
 */
export function screenFlight(input: unknown): ScreeningResult {
  return screenValidated(validateScreeningInput(input));
}
