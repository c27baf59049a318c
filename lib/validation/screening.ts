import { z } from 'zod';
import { isoTimeMs } from './iso-time';

/**
 * Input limits of a single-flight screening. Shared by the schema, forms and the engine so the
 * numbers live in one place. Masses in kg, flight levels in hundreds of feet, altitudes in metres.
 */
export const SCREENING_LIMITS = {
  minWaypoints: 2,
  maxWaypoints: 500,
  maxFlightPlanChars: 10_000,
  minTrackPoints: 2,
  maxTrackPoints: 20_000,
  maxTrackMach: 3,
  /** Whole-aircraft fuel flow on a track point, kg/h. */
  minTrackFuelFlowKgH: 1,
  maxTrackFuelFlowKgH: 100_000,
  maxSteps: 50,
  minFlightLevel: 0,
  maxFlightLevel: 660,
  maxStepFromKm: 40_000,
  minFuelKg: 1,
  maxFuelKg: 500_000,
  minMach: 0.1,
  maxMach: 3,
  maxEiNoxGPerKg: 200,
  minEngineCount: 1,
  maxEngineCount: 8,
  maxCertFuelFlowKgS: 50,
  minSoundingLevels: 3,
  maxSoundingLevels: 500,
  minSoundingTemperatureK: 100,
  maxSoundingTemperatureK: 350,
  minSoundingAltitudeM: -500,
  maxSoundingAltitudeM: 50_000,
  maxSoundingPressureHpa: 1100,
  minTropopauseAltitudeM: 3000,
  maxTropopauseAltitudeM: 25_000,
  minTropopausePressureHpa: 25,
  maxTropopausePressureHpa: 700,
} as const;

import type { FieldProblem } from './problems';
export type { FieldProblem };

type IssueLike = { input?: unknown };

function numberField(label: string) {
  return z.number({
    error: (issue: IssueLike) => (issue.input === undefined ? `${label} is required.` : `${label} must be a number.`),
  });
}

function between(label: string, min: number, max: number, unit: string) {
  const message = `${label} must be between ${min} and ${max}${unit ? ` ${unit}` : ''}.`;
  return numberField(label).min(min, { error: message }).max(max, { error: message });
}

function wholeBetween(label: string, min: number, max: number, unit: string) {
  return between(label, min, max, unit).int({ error: `${label} must be a whole number.` });
}

const latitudeSchema = between('Latitude', -90, 90, 'degrees');
const longitudeSchema = between('Longitude', -180, 180, 'degrees');

/** A route point given by coordinates, degrees (WGS-84 latitude -90..90, longitude -180..180). */
export const coordinateWaypointSchema = z.strictObject({ lat: latitudeSchema, lon: longitudeSchema });

/** A route point given by an airport's ICAO (4 characters) or IATA (3 letters) code. */
export const airportWaypointSchema = z.strictObject({
  airport: z
    .string({ error: 'An airport code must be text, such as EGLL or LHR.' })
    .trim()
    .regex(/^[A-Za-z0-9]{3,4}$/, {
      error: 'An airport code has 3 letters (IATA, such as LHR) or 4 characters (ICAO, such as EGLL).',
    }),
});

/** A waypoint: `{ lat, lon }` in degrees or `{ airport }` (ICAO or IATA code). */
export const waypointSchema = z.union([airportWaypointSchema, coordinateWaypointSchema], {
  error: 'Give each waypoint either as lat and lon, or as an airport code.',
});

/** Flight level: pressure altitude in hundreds of feet on 1013.25 hPa, whole number 0-660. */
export const flightLevelSchema = wholeBetween(
  'The flight level',
  SCREENING_LIMITS.minFlightLevel,
  SCREENING_LIMITS.maxFlightLevel,
  '',
);

/** One step of a step climb: from `fromKm` along the route (km) the aircraft cruises at `flightLevel`. */
export const cruiseStepSchema = z.strictObject({
  fromKm: between('The step start', 0, SCREENING_LIMITS.maxStepFromKm, 'km along the route'),
  flightLevel: flightLevelSchema,
});

const stepsSchema = z
  .array(cruiseStepSchema, { error: 'Steps must be a list of { fromKm, flightLevel }.' })
  .min(1, { error: 'Give at least one cruise step.' })
  .max(SCREENING_LIMITS.maxSteps, { error: `Give at most ${SCREENING_LIMITS.maxSteps} cruise steps.` })
  .superRefine((steps, ctx) => {
    if (steps.length > 0 && steps[0].fromKm !== 0) {
      ctx.addIssue({
        code: 'custom',
        path: [0, 'fromKm'],
        message: 'The first cruise step must start at 0 km.',
      });
    }
    for (let i = 1; i < steps.length; i++) {
      if (!(steps[i].fromKm > steps[i - 1].fromKm)) {
        ctx.addIssue({
          code: 'custom',
          path: [i, 'fromKm'],
          message: 'Each cruise step must start further along the route than the one before.',
        });
      }
    }
  });

/** Cruise: one `flightLevel` for the whole route, or `steps` (first at 0 km, increasing). */
export const cruiseSchema = z.union(
  [z.strictObject({ flightLevel: flightLevelSchema }), z.strictObject({ steps: stepsSchema })],
  { error: 'Give the cruise either as one flight level or as a list of steps.' },
);

const certFuelFlowSchema = numberField('A certification fuel flow')
  .gt(0, { error: 'A certification fuel flow must be above 0 kg/s.' })
  .max(SCREENING_LIMITS.maxCertFuelFlowKgS, {
    error: `A certification fuel flow must be at most ${SCREENING_LIMITS.maxCertFuelFlowKgS} kg/s.`,
  });
const certEiSchema = numberField('A certification EI NOx')
  .gt(0, { error: 'A certification EI NOx must be above 0 g/kg (the fit works on its logarithm).' })
  .max(SCREENING_LIMITS.maxEiNoxGPerKg, {
    error: `A certification EI NOx must be at most ${SCREENING_LIMITS.maxEiNoxGPerKg} g/kg.`,
  });

const MODE_NAMES = ['idle', 'approach', 'climb-out', 'take-off'] as const;

/**
 * ICAO Annex 16 Vol II engine certification data, modes in the order [idle 7 %, approach 30 %,
 * climb-out 85 %, take-off 100 %]: fuel flow per engine in kg/s (positive, rising idle -> take-off)
 * and EI NOx in g NO2 per kg fuel (above 0, at most 200).
 */
export const engineCertSchema = z
  .strictObject({
    fuelFlowKgS: z.tuple([certFuelFlowSchema, certFuelFlowSchema, certFuelFlowSchema, certFuelFlowSchema], {
      error: 'Give four fuel flows in kg/s: idle, approach, climb-out, take-off.',
    }),
    eiNoxGPerKg: z.tuple([certEiSchema, certEiSchema, certEiSchema, certEiSchema], {
      error: 'Give four EI NOx values in g/kg: idle, approach, climb-out, take-off.',
    }),
  })
  .superRefine((engine, ctx) => {
    const flows = engine.fuelFlowKgS;
    for (let i = 1; i < 4; i++) {
      if (!(flows[i] > flows[i - 1])) {
        ctx.addIssue({
          code: 'custom',
          path: ['fuelFlowKgS', i],
          message: `The ${MODE_NAMES[i]} fuel flow must be higher than the ${MODE_NAMES[i - 1]} fuel flow.`,
        });
      }
    }
  });

/** Direct cruise EI NOx, g NO2 per kg fuel, 0-200. */
export const directEmissionSchema = z.strictObject({
  eiNoxGPerKg: between('The EI NOx', 0, SCREENING_LIMITS.maxEiNoxGPerKg, 'g/kg'),
});

/** Engine certification data with engine count, optional Mach for the correction and method. */
export const engineEmissionSchema = z.strictObject({
  engine: engineCertSchema,
  engineCount: wholeBetween('The engine count', SCREENING_LIMITS.minEngineCount, SCREENING_LIMITS.maxEngineCount, ''),
  mach: between('The Mach number', SCREENING_LIMITS.minMach, SCREENING_LIMITS.maxMach, '').optional(),
  method: z.enum(['bffm2', 'dlr'], { error: 'The method must be bffm2 or dlr.' }).optional(),
});

/** Emission: a direct `eiNoxGPerKg`, or `{ engine, engineCount, mach?, method? }`. */
export const emissionSchema = z.union([engineEmissionSchema, directEmissionSchema], {
  error: 'Give the emission either as an EI NOx in g/kg, or as engine certification data with an engine count.',
});

/**
 * One sounding level: temperature in K (above 100, below 350) and an altitude (geopotential m,
 * -500..50 000) or a pressure (hPa, above 0, at most 1100), or both.
 */
export const soundingLevelSchema = z
  .strictObject({
    altitudeM: between(
      'The altitude',
      SCREENING_LIMITS.minSoundingAltitudeM,
      SCREENING_LIMITS.maxSoundingAltitudeM,
      'm',
    ).optional(),
    pressureHpa: numberField('The pressure')
      .gt(0, { error: 'The pressure must be above 0 hPa.' })
      .max(SCREENING_LIMITS.maxSoundingPressureHpa, {
        error: `The pressure must be at most ${SCREENING_LIMITS.maxSoundingPressureHpa} hPa.`,
      })
      .optional(),
    temperatureK: numberField('The temperature')
      .gt(SCREENING_LIMITS.minSoundingTemperatureK, {
        error: `The temperature must be above ${SCREENING_LIMITS.minSoundingTemperatureK} K: is it in kelvin?`,
      })
      .lt(SCREENING_LIMITS.maxSoundingTemperatureK, {
        error: `The temperature must be below ${SCREENING_LIMITS.maxSoundingTemperatureK} K: is it in kelvin?`,
      }),
  })
  .superRefine((level, ctx) => {
    if (level.altitudeM === undefined && level.pressureHpa === undefined) {
      ctx.addIssue({ code: 'custom', path: [], message: 'Give each sounding level an altitude or a pressure.' });
    }
  });

/** A sounding level as the engine reads it (altitude geopotential m, pressure hPa, temperature K). */
export interface SoundingLevelInput {
  altitudeM?: number;
  pressureHpa?: number;
  temperatureK: number;
}

function isFiniteNumber(x: unknown): x is number {
  return typeof x === 'number' && Number.isFinite(x);
}

/**
 * Field problems of one sounding level given as any value (used by the engine for inputs that did
 * not pass through the schema). Same rules and messages as `soundingLevelSchema`.
 */
export function soundingLevelProblems(level: unknown, path: string): FieldProblem[] {
  const out: FieldProblem[] = [];
  if (typeof level !== 'object' || level === null || Array.isArray(level)) {
    out.push({ path, message: 'Each sounding level must be { altitudeM?, pressureHpa?, temperatureK }.' });
    return out;
  }
  const l = level as Record<string, unknown>;
  const L = SCREENING_LIMITS;
  if (!isFiniteNumber(l.temperatureK)) {
    out.push({
      path: `${path}.temperatureK`,
      message: l.temperatureK === undefined ? 'The temperature is required.' : 'The temperature must be a number.',
    });
  } else if (!(l.temperatureK > L.minSoundingTemperatureK)) {
    out.push({
      path: `${path}.temperatureK`,
      message: `The temperature must be above ${L.minSoundingTemperatureK} K: is it in kelvin?`,
    });
  } else if (!(l.temperatureK < L.maxSoundingTemperatureK)) {
    out.push({
      path: `${path}.temperatureK`,
      message: `The temperature must be below ${L.maxSoundingTemperatureK} K: is it in kelvin?`,
    });
  }
  if (l.altitudeM !== undefined) {
    if (!isFiniteNumber(l.altitudeM))
      out.push({ path: `${path}.altitudeM`, message: 'The altitude must be a number.' });
    else if (l.altitudeM < L.minSoundingAltitudeM || l.altitudeM > L.maxSoundingAltitudeM) {
      out.push({
        path: `${path}.altitudeM`,
        message: `The altitude must be between ${L.minSoundingAltitudeM} and ${L.maxSoundingAltitudeM} m.`,
      });
    }
  }
  if (l.pressureHpa !== undefined) {
    if (!isFiniteNumber(l.pressureHpa))
      out.push({ path: `${path}.pressureHpa`, message: 'The pressure must be a number.' });
    else if (!(l.pressureHpa > 0))
      out.push({ path: `${path}.pressureHpa`, message: 'The pressure must be above 0 hPa.' });
    else if (l.pressureHpa > L.maxSoundingPressureHpa) {
      out.push({
        path: `${path}.pressureHpa`,
        message: `The pressure must be at most ${L.maxSoundingPressureHpa} hPa.`,
      });
    }
  }
  if (l.altitudeM === undefined && l.pressureHpa === undefined) {
    out.push({ path, message: 'Give each sounding level an altitude or a pressure.' });
  }
  for (const key of Object.keys(l)) {
    if (key !== 'altitudeM' && key !== 'pressureHpa' && key !== 'temperatureK') {
      out.push({ path: `${path}.${key}`, message: `A sounding level has no field "${key}".` });
    }
  }
  return out;
}

/**
 * Problems of a sounding as a whole: fewer than 3 levels, more than 500, two levels at the same
 * altitude or pressure, and pressures that do not fall as altitude rises. Levels that are themselves
 * invalid are skipped here (their own problems are reported per level).
 */
export function soundingSetProblems(levels: readonly unknown[], path: string): FieldProblem[] {
  const out: FieldProblem[] = [];
  const L = SCREENING_LIMITS;
  if (levels.length < L.minSoundingLevels) {
    out.push({ path, message: `A sounding needs at least ${L.minSoundingLevels} levels.` });
  }
  if (levels.length > L.maxSoundingLevels) {
    out.push({ path, message: `A sounding may have at most ${L.maxSoundingLevels} levels.` });
  }
  const seenAltitude = new Map<number, number>();
  const seenPressure = new Map<number, number>();
  const both: { i: number; z: number; p: number }[] = [];
  for (let i = 0; i < levels.length; i++) {
    const l = levels[i] as Partial<Record<string, unknown>> | null;
    if (typeof l !== 'object' || l === null) continue;
    const z = l.altitudeM;
    const p = l.pressureHpa;
    if (isFiniteNumber(z)) {
      const j = seenAltitude.get(z);
      if (j !== undefined) {
        out.push({ path: `${path}.${i}.altitudeM`, message: `This level repeats the altitude of level ${j + 1}.` });
      } else seenAltitude.set(z, i);
    }
    if (isFiniteNumber(p)) {
      const j = seenPressure.get(p);
      if (j !== undefined) {
        out.push({ path: `${path}.${i}.pressureHpa`, message: `This level repeats the pressure of level ${j + 1}.` });
      } else seenPressure.set(p, i);
    }
    if (isFiniteNumber(z) && isFiniteNumber(p)) both.push({ i, z, p });
  }
  both.sort((a, b) => a.z - b.z);
  for (let k = 1; k < both.length; k++) {
    if (both[k].z !== both[k - 1].z && !(both[k].p < both[k - 1].p)) {
      out.push({
        path: `${path}.${both[k].i}.pressureHpa`,
        message: 'Pressure must fall as altitude rises: check this level against the one below it.',
      });
    }
  }
  return out;
}

/** A sounding: 3..500 levels in any order, no duplicates, pressure falling with altitude. */
export const soundingSchema = z
  .array(soundingLevelSchema, { error: 'A sounding must be a list of levels.' })
  .superRefine((levels, ctx) => {
    for (const p of soundingSetProblems(levels, '')) {
      ctx.addIssue({ code: 'custom', path: p.path.split('.').filter(Boolean).map(toPathKey), message: p.message });
    }
  });

function toPathKey(segment: string): string | number {
  return /^\d+$/.test(segment) ? Number(segment) : segment;
}

/**
 * Per-flight tropopause override: `{ altitudeM }` (ISA pressure altitude, 3000-25 000 m),
 * `{ pressureHpa }` (25-700 hPa) or `{ sounding }` (levels, WMO 1957 lapse-rate tropopause).
 */
export const tropopauseOverrideSchema = z.union(
  [
    z.strictObject({
      altitudeM: between(
        'The tropopause altitude',
        SCREENING_LIMITS.minTropopauseAltitudeM,
        SCREENING_LIMITS.maxTropopauseAltitudeM,
        'm',
      ),
    }),
    z.strictObject({
      pressureHpa: between(
        'The tropopause pressure',
        SCREENING_LIMITS.minTropopausePressureHpa,
        SCREENING_LIMITS.maxTropopausePressureHpa,
        'hPa',
      ),
    }),
    z.strictObject({ sounding: soundingSchema }),
  ],
  { error: 'Give the tropopause as an altitude in m, a pressure in hPa, or a sounding.' },
);

/** A screening input with a low-central-high band: one number (used for all three) or the three. */
function rangeSchema(label: string, min: number, max: number, unit: string) {
  const value = between(label, min, max, unit);
  return z.union(
    [
      value,
      z.strictObject({ central: value, low: value, high: value }).superRefine((r, ctx) => {
        if (!(r.low <= r.central && r.central <= r.high)) {
          ctx.addIssue({
            code: 'custom',
            path: [],
            message: `${label}: low must not exceed central, nor central exceed high.`,
          });
        }
      }),
    ],
    { error: `${label} must be a number or { central, low, high }.` },
  );
}

/** Names of the embedded AFGL 1986 ozone profiles. */
export const OZONE_PROFILE_NAMES = [
  'tropical',
  'midlatitude-summer',
  'midlatitude-winter',
  'subarctic-summer',
  'subarctic-winter',
] as const;

const increasingList = (label: string, min: number, max: number, unit: string) =>
  z
    .array(between(label, min, max, unit))
    .min(2, { error: `${label}: give at least 2 values.` })
    .max(200, { error: `${label}: give at most 200 values.` })
    .superRefine((xs, ctx) => {
      for (let i = 1; i < xs.length; i++) {
        if (!(xs[i] > xs[i - 1])) ctx.addIssue({ code: 'custom', path: [i], message: `${label} must increase.` });
      }
    });

/** A user ozone profile: geometric altitudes in km (increasing) and O3 volume mixing ratios in ppmv. */
export const customOzoneProfileSchema = z
  .strictObject({
    altitudeKm: increasingList('The ozone profile altitudes', 0, 60, 'km'),
    ppmv: z.array(between('An ozone mixing ratio', 0, 20, 'ppmv')),
  })
  .superRefine((p, ctx) => {
    if (p.ppmv.length !== p.altitudeKm.length) {
      ctx.addIssue({ code: 'custom', path: ['ppmv'], message: 'Give one ozone mixing ratio per altitude.' });
    }
  });

/**
 * Physical bounds of the ozone-figure overrides (SCIENCE.md section 5, from memory: confirm).
 * Residence above the tropopause up to about 5 years (mean age of stratospheric air is at most about
 * 5-6 years, Waugh & Hall 2002, Rev. Geophys. 40, 1010); band factors up to about 5; J(O3 -> O) up to
 * about 1e-3 s^-1 and J(NO2) 5e-3 to 2e-2 s^-1 with the sun overhead in the lower stratosphere.
 */
export const OVERRIDE_BOUNDS = {
  minResidenceYears: 0.01,
  maxResidenceYears: 5,
  minLowFactor: 0.2,
  maxHighFactor: 5,
  minJO3PerS: 1e-5,
  maxJO3PerS: 1e-3,
  minJNo2PerS: 5e-3,
  maxJNo2PerS: 2e-2,
  minNoxToNoy: 0.01,
  minOhCm3: 1e4,
  maxOhCm3: 1e8,
} as const;

const B = OVERRIDE_BOUNDS;

/**
 * Residence time above the tropopause by depth: nodes in km (first 0) and years for the
 * extratropics, optionally `tropicalYears` for |lat| up to 20 degrees (linear to 30), with band factors.
 * Without `tropicalYears` the default tropical table stays when the depths are the default nodes
 * (0, 1, 2, 4, 6, 9 km); with other depths the given years apply at every latitude.
 */
export const residenceTimeSchema = z
  .strictObject({
    depthKm: increasingList('The residence-time depths', 0, 40, 'km'),
    years: z.array(between('A residence time', B.minResidenceYears, B.maxResidenceYears, 'years')),
    tropicalYears: z
      .array(between('A tropical residence time', B.minResidenceYears, B.maxResidenceYears, 'years'))
      .optional(),
    lowFactor: between('The low residence-time factor', B.minLowFactor, 1, '').optional(),
    highFactor: between('The high residence-time factor', 1, B.maxHighFactor, '').optional(),
  })
  .superRefine((r, ctx) => {
    if (r.years.length !== r.depthKm.length) {
      ctx.addIssue({ code: 'custom', path: ['years'], message: 'Give one residence time per depth.' });
    }
    if (r.tropicalYears !== undefined && r.tropicalYears.length !== r.depthKm.length) {
      ctx.addIssue({ code: 'custom', path: ['tropicalYears'], message: 'Give one tropical residence time per depth.' });
    }
    if (r.depthKm.length > 0 && r.depthKm[0] !== 0) {
      ctx.addIssue({ code: 'custom', path: ['depthKm', 0], message: 'The first residence-time depth must be 0 km.' });
    }
  });

/**
 * Overrides of the ozone-figure and emission-index inputs; anything left out
 * keeps its documented default. J values in s^-1 with the sun overhead (the names keep the word noon),
 * densities in molecule cm^-3.
 */
export const assumptionsSchema = z.strictObject({
  jO3NoonPerS: rangeSchema('J(O3 -> O)', B.minJO3PerS, B.maxJO3PerS, 's^-1').optional(),
  jNo2NoonPerS: rangeSchema('J(NO2)', B.minJNo2PerS, B.maxJNo2PerS, 's^-1').optional(),
  daylightFactor: rangeSchema('The daylight-average factor', 0.01, 1, '').optional(),
  noxToNoyFraction: rangeSchema('The NOx/NOy fraction', B.minNoxToNoy, 1, '').optional(),
  residenceTime: residenceTimeSchema.optional(),
  ohCm3: between('The OH density', B.minOhCm3, B.maxOhCm3, 'molecules per cm^3').optional(),
  ho2Cm3: between('The HO2 density', 1e3, 1e9, 'molecules per cm^3').optional(),
  relativeHumidity: between('The relative humidity', 0, 1, '(a fraction, 0.6 for 60 %)').optional(),
  ozoneProfile: z
    .union([z.enum(OZONE_PROFILE_NAMES), customOzoneProfileSchema], {
      error: `The ozone profile must be one of ${OZONE_PROFILE_NAMES.join(', ')}, or { altitudeKm, ppmv }.`,
    })
    .optional(),
});

/** Monte Carlo sampling of a screening: 50..5000 samples (default 400) and a seed 0..4 294 967 295 (default 1). */
export const uncertaintyOptionsSchema = z.strictObject(
  {
    samples: wholeBetween('The number of samples', 50, 5000, '').optional(),
    seed: wholeBetween('The seed', 0, 4_294_967_295, '').optional(),
  },
  { error: 'The uncertainty options must be { samples?, seed? }.' },
);

const airportCodeSchema = (label: string) =>
  z
    .string({ error: `${label} must be text, such as EGLL or LHR.` })
    .trim()
    .regex(/^[A-Za-z0-9]{3,4}$/, {
      error: `${label} has 3 letters (IATA, such as LHR) or 4 characters (ICAO, such as EGLL).`,
    });

/** A route given as waypoints: 2..500 points, each `{ lat, lon }` or `{ airport }`. */
export const waypointsRouteSchema = z.object(
  {
    waypoints: z
      .array(waypointSchema, { error: 'The waypoints must be a list.' })
      .min(SCREENING_LIMITS.minWaypoints, { error: 'A route needs at least 2 waypoints.' })
      .max(SCREENING_LIMITS.maxWaypoints, {
        error: `A route may have at most ${SCREENING_LIMITS.maxWaypoints} waypoints.`,
      }),
  },
  { error: 'The route is required, as { waypoints: [...] } or { flightPlan: { text, from, to } }.' },
);

/**
 * A route given as an ICAO flight plan: the item-15 route `text` (ICAO Doc 4444 Appendix 2) between
 * the departure `from` and destination `to` (ICAO or IATA codes). Its levels, when it has any, are
 * flown instead of `cruise`.
 */
export const flightPlanRouteSchema = z.strictObject({
  flightPlan: z.strictObject(
    {
      text: z
        .string({ error: 'The flight-plan route must be text, such as N0480F350 DCT 55N020W 55N030W DCT.' })
        .trim()
        .min(1, { error: 'Paste the flight-plan route (item 15), such as N0480F350 DCT 55N020W 55N030W DCT.' })
        .max(SCREENING_LIMITS.maxFlightPlanChars, {
          error: `A flight-plan route may have at most ${SCREENING_LIMITS.maxFlightPlanChars} characters.`,
        }),
      from: airportCodeSchema('The departure aerodrome'),
      to: airportCodeSchema('The destination aerodrome'),
    },
    { error: 'The flight plan must be { text, from, to }.' },
  ),
});

const ISO_TIME_RE = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,6})?)?(Z|[+-]\d{2}:?\d{2})$/;
/** ISA speed of sound at sea level, m/s (ICAO Doc 7488/3): the most lenient bound for the Mach 3 check. */
const SEA_LEVEL_SPEED_OF_SOUND_MS = 340.294;

/**
 * One point of a flown track: degrees, an optional UTC time (ISO 8601 with a zone), and its level as
 * a flight level (0-660) or a pressure altitude in feet (0-66 000), or neither (the cruise is used).
 */
export const trackPointSchema = z
  .strictObject({
    time: z
      .string({ error: 'The time must be text such as 2026-11-20T10:15:00Z.' })
      .regex(ISO_TIME_RE, { error: 'Write the time as YYYY-MM-DDTHH:MM:SSZ (UTC), such as 2026-11-20T10:15:00Z.' })
      .refine((t) => Number.isFinite(isoTimeMs(t)), { error: 'The time is not a real date and time.' })
      .optional(),
    lat: latitudeSchema,
    lon: longitudeSchema,
    flightLevel: between(
      'The flight level',
      SCREENING_LIMITS.minFlightLevel,
      SCREENING_LIMITS.maxFlightLevel,
      '',
    ).optional(),
    pressureAltitudeFt: between(
      'The pressure altitude',
      SCREENING_LIMITS.minFlightLevel * 100,
      SCREENING_LIMITS.maxFlightLevel * 100,
      'ft (FL0-FL660)',
    ).optional(),
    fuelFlowKgH: between(
      'The fuel flow',
      SCREENING_LIMITS.minTrackFuelFlowKgH,
      SCREENING_LIMITS.maxTrackFuelFlowKgH,
      'kg/h (the whole aircraft)',
    ).optional(),
  })
  .superRefine((p, ctx) => {
    if (p.flightLevel !== undefined && p.pressureAltitudeFt !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['pressureAltitudeFt'],
        message: 'Give the flight level or the pressure altitude, not both.',
      });
    }
  });

function greatCircleM(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const r = Math.PI / 180;
  const h =
    Math.sin(((lat2 - lat1) * r) / 2) ** 2 +
    Math.cos(lat1 * r) * Math.cos(lat2 * r) * Math.sin(((lon2 - lon1) * r) / 2) ** 2;
  return 2 * 6_371_008.8 * Math.asin(Math.min(1, Math.sqrt(h)));
}

/**
 * A flown track: 2..20 000 points in time order. Times on every point or on none; time never runs
 * backwards; no jump between two timed points faster than Mach 3 (at the sea-level speed of sound).
 */
export const trackRouteSchema = z.strictObject({
  track: z.strictObject(
    {
      points: z
        .array(trackPointSchema, { error: 'The track points must be a list.' })
        .min(SCREENING_LIMITS.minTrackPoints, { error: 'A track needs at least 2 points.' })
        .max(SCREENING_LIMITS.maxTrackPoints, {
          error: `A track may have at most ${SCREENING_LIMITS.maxTrackPoints} points.`,
        })
        .superRefine((points, ctx) => {
          const flows = points.filter((p) => p.fuelFlowKgH !== undefined).length;
          if (flows > 0 && flows < points.length) {
            const i = points.findIndex((p) => p.fuelFlowKgH === undefined);
            ctx.addIssue({
              code: 'custom',
              path: [i, 'fuelFlowKgH'],
              message: 'Give a fuel flow on every point of the track, or on none (the entered total is then spread).',
            });
          }
          const timed = points.filter((p) => p.time !== undefined).length;
          if (flows > 0 && timed === 0) {
            ctx.addIssue({
              code: 'custom',
              path: [0, 'time'],
              message: 'A fuel flow per point is integrated over time: give a time on every point of the track.',
            });
            return;
          }
          if (timed > 0 && timed < points.length) {
            const i = points.findIndex((p) => p.time === undefined);
            ctx.addIssue({
              code: 'custom',
              path: [i, 'time'],
              message: 'Give a time on every point of the track, or on none.',
            });
            return;
          }
          if (timed === 0) return;
          const maxMs = SCREENING_LIMITS.maxTrackMach * SEA_LEVEL_SPEED_OF_SOUND_MS;
          let reported = 0;
          for (let i = 1; i < points.length && reported < 20; i++) {
            const t0 = isoTimeMs(points[i - 1].time ?? '');
            const t1 = isoTimeMs(points[i].time ?? '');
            if (!Number.isFinite(t0) || !Number.isFinite(t1)) continue;
            if (t1 < t0) {
              ctx.addIssue({
                code: 'custom',
                path: [i, 'time'],
                message: 'Time runs backwards here: the points of a track must be in time order.',
              });
              reported++;
              continue;
            }
            const d = greatCircleM(points[i - 1].lat, points[i - 1].lon, points[i].lat, points[i].lon);
            if (d > (maxMs * Math.max(t1 - t0, 0)) / 1000 && d > 1) {
              ctx.addIssue({
                code: 'custom',
                path: [i],
                message: `This point is ${(d / 1000).toFixed(0)} km from the one before in ${((t1 - t0) / 1000).toFixed(0)} s: faster than Mach ${SCREENING_LIMITS.maxTrackMach}. Check its position and time.`,
              });
              reported++;
            }
          }
        }),
    },
    { error: 'The track must be { points: [...] }.' },
  ),
});

/** The route: `{ waypoints }`, `{ flightPlan: { text, from, to } }` or `{ track: { points } }`. */
export const routeSchema = z.union([waypointsRouteSchema, flightPlanRouteSchema, trackRouteSchema], {
  error:
    'The route is required, as { waypoints: [...] }, { flightPlan: { text, from, to } } or { track: { points: [...] } }.',
});

function isRealDate(s: string): boolean {
  const y = Number(s.slice(0, 4));
  const m = Number(s.slice(5, 7));
  const d = Number(s.slice(8, 10));
  if (y < 1900 || y > 2200 || m < 1 || m > 12 || d < 1) return false;
  const t = new Date(Date.UTC(y, m - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
}

/**
 * The `screenFlight` input (the public engine contract): route, cruise, Mach (timing, default
 * 0.80), cruise fuel (kg, 1-500 000), emission, month (1-12) or flight date (YYYY-MM-DD, UTC),
 * optional tropopause override and assumption overrides. Client-safe (no Node imports).
 */
export const screeningInputSchema = z.object(
  {
    route: routeSchema,
    cruise: cruiseSchema,
    mach: between('The Mach number', SCREENING_LIMITS.minMach, SCREENING_LIMITS.maxMach, '').optional(),
    fuelBurnKg: between('The fuel burn', SCREENING_LIMITS.minFuelKg, SCREENING_LIMITS.maxFuelKg, 'kg'),
    emission: emissionSchema,
    month: wholeBetween('The month', 1, 12, '').optional(),
    flightDate: z
      .string({ error: 'The flight date must be text as YYYY-MM-DD.' })
      .regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'The flight date must be written YYYY-MM-DD.' })
      .refine(isRealDate, { error: 'The flight date is not a real calendar date.' })
      .optional(),
    tropopause: tropopauseOverrideSchema.optional(),
    assumptions: assumptionsSchema.optional(),
    uncertainty: uncertaintyOptionsSchema.optional(),
  },
  { error: 'The screening input must be an object.' },
);

/** A validated screening input (the schema's output). */
export type ScreeningInput = z.output<typeof screeningInputSchema>;
/** A screening input as sent by a client (the schema's input). */
export type ScreeningInputRaw = z.input<typeof screeningInputSchema>;
/** A validated route: waypoints or a flight plan. */
export type Route = z.output<typeof routeSchema>;
/** A validated screening input whose route is given as waypoints. */
export type WaypointsScreeningInput = Omit<ScreeningInput, 'route'> & { route: z.output<typeof waypointsRouteSchema> };
/** A validated waypoint: `{ lat, lon }` in degrees or `{ airport }` code. */
export type Waypoint = z.output<typeof waypointSchema>;
/** A validated cruise: `{ flightLevel }` or `{ steps }`. */
export type Cruise = z.output<typeof cruiseSchema>;
/** A validated cruise step: `fromKm` (km along the route) and `flightLevel`. */
export type CruiseStep = z.output<typeof cruiseStepSchema>;
/** Validated certification data (kg/s and g/kg per mode, idle -> take-off). */
export type EngineCert = z.output<typeof engineCertSchema>;
/** A validated emission: direct EI (g/kg) or engine data. */
export type Emission = z.output<typeof emissionSchema>;
/** A validated sounding level (geopotential m, hPa, K). */
export type SoundingLevel = z.output<typeof soundingLevelSchema>;
/** A validated tropopause override. */
export type TropopauseOverride = z.output<typeof tropopauseOverrideSchema>;
/** Validated assumption overrides of the ozone figure and the EI humidity. */
export type Assumptions = z.output<typeof assumptionsSchema>;
/** Name of an embedded AFGL 1986 ozone profile. */
export type OzoneProfileName = (typeof OZONE_PROFILE_NAMES)[number];

/**
 * Options of `compareCruiseLevels`: level changes in feet (multiples of 100, -10 000..10 000, at
 * most 21), fuel penalty in % per 1000 ft of deviation (0-10) and the planner's limit in % (0-50).
 */
export const compareCruiseLevelsOptionsSchema = z.strictObject({
  deltasFt: z
    .array(
      wholeBetween('A level change', -10_000, 10_000, 'ft').refine((d) => d % 100 === 0, {
        error: 'A level change must be a whole number of hundreds of feet.',
      }),
    )
    .min(1, { error: 'Give at least one level change.' })
    .max(21, { error: 'Give at most 21 level changes.' })
    .optional(),
  fuelPenaltyPctPer1000Ft: between('The fuel penalty', 0, 10, '% per 1000 ft').optional(),
  maxFuelPenaltyPct: between('The fuel-penalty limit', 0, 50, '%').optional(),
  minimise: z
    .enum(['nox-above-tropopause', 'ozone-figure'], {
      error: 'What to minimise must be nox-above-tropopause or ozone-figure.',
    })
    .optional(),
});
/** `compareCruiseLevels` options as a client sends them. */
export type CompareCruiseLevelsOptions = z.input<typeof compareCruiseLevelsOptionsSchema>;

/** `months` in a preview body: true adds the month sweep (the flight screened in each month 1-12). */
export const previewMonthsSchema = z.boolean({ error: 'months must be true or false.' });

/** The preview body as documented: the screening input plus `months` (and the service's name, aircraft, whatIf). */
export const screeningPreviewBodySchema = screeningInputSchema.extend({
  months: previewMonthsSchema.optional(),
  whatIf: compareCruiseLevelsOptionsSchema.optional(),
});
