import { z } from 'zod';
import { hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE } from './display-text';

/** True for an existing calendar date written YYYY-MM-DD. */
export function isCalendarDate(s: unknown): s is string {
  if (typeof s !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(s)) return false;
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

/** A calendar date as YYYY-MM-DD (UTC), checked to exist. */
export const isoDateSchema = z
  .string({ error: 'Give a date as YYYY-MM-DD.' })
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Give a date as YYYY-MM-DD.')
  .refine(isCalendarDate, 'That date does not exist.');

/** Longest period a comparison or a report may cover, in calendar months. */
export const MAX_PERIOD_MONTHS = 36;

export function monthsSpanned(from: string, to: string): number {
  const [fy, fm] = from.split('-').map(Number);
  const [ty, tm] = to.split('-').map(Number);
  return (ty - fy) * 12 + (tm - fm) + 1;
}

export const fleetNameSchema = z
  .string({ error: 'Give the fleet a name.' })
  .trim()
  .min(1, 'Give the fleet a name.')
  .max(80, 'Use at most 80 characters.')
  .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE);

const descriptionSchema = z
  .string({ error: 'The description must be text.' })
  .trim()
  .max(500, 'Use at most 500 characters.');

export const fleetCreateSchema = z.object({
  name: fleetNameSchema,
  description: descriptionSchema.optional(),
});
export type FleetCreate = z.infer<typeof fleetCreateSchema>;

const idSchema = z.coerce
  .number({ error: 'Choose an item from the list.' })
  .int('Choose an item from the list.')
  .positive('Choose an item from the list.');

export const fleetUpdateSchema = z
  .object({
    name: fleetNameSchema.optional(),
    description: descriptionSchema.optional(),
    /** When given, exactly these aircraft types default to this fleet (others that did are cleared). */
    aircraftTypeIds: z
      .array(idSchema, { error: 'List aircraft type ids.' })
      .max(200, 'At most 200 aircraft types.')
      .optional(),
  })
  .refine((v) => v.name !== undefined || v.description !== undefined || v.aircraftTypeIds !== undefined, {
    message: 'Change the name, the description or the aircraft types.',
    path: ['name'],
  });
export type FleetUpdate = z.infer<typeof fleetUpdateSchema>;

export const aircraftFleetSchema = z.object({
  aircraftTypeId: idSchema,
  fleetId: z.union([idSchema, z.null()]),
});
export type AircraftFleet = z.infer<typeof aircraftFleetSchema>;

export const GROUP_BY = ['fleet', 'month', 'aircraft'] as const;
export type GroupBy = (typeof GROUP_BY)[number];

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

const flightLevelFilter = z.preprocess(
  blankToUndefined,
  z.coerce
    .number({ error: 'Give a flight level such as 350.' })
    .int('Give a whole flight level such as 350.')
    .min(0, 'Flight levels run from 0 to 660.')
    .max(660, 'Flight levels run from 0 to 660.')
    .optional(),
);

const fleetIdList = z.preprocess((v) => {
  const b = blankToUndefined(v);
  if (typeof b === 'string')
    return b
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean);
  return b;
}, z.array(idSchema).max(50, 'Compare at most 50 fleets at once.').optional());

/**
 * The comparison's filters, as query text (`?from=&to=&aircraft=&route=&minFl=&maxFl=&groupBy=&fleets=`)
 * or as an object. The level band keeps flights whose cruise (first to highest level) touches it.
 */
/**
 * What a fleet comparison sums: the planned flights (schedule imports), the flown flights (track
 * imports), or each flight's flown track where it has one and its plan otherwise.
 */
export const FLIGHT_BASES = ['planned', 'flown', 'flown-where-available'] as const;
export type FlightBasisChoice = (typeof FLIGHT_BASES)[number];

export const fleetCompareQuerySchema = z
  .object({
    from: z.preprocess(blankToUndefined, isoDateSchema.optional()),
    to: z.preprocess(blankToUndefined, isoDateSchema.optional()),
    aircraft: z.preprocess(
      blankToUndefined,
      z.string().trim().max(16, 'An aircraft type code has at most 16 characters.').optional(),
    ),
    route: z.preprocess(
      blankToUndefined,
      z.string().trim().max(40, 'Use at most 40 characters, such as EGLL-KSFO.').optional(),
    ),
    minFl: flightLevelFilter,
    maxFl: flightLevelFilter,
    groupBy: z.preprocess(
      blankToUndefined,
      z.enum(GROUP_BY, { error: 'Group by fleet, month or aircraft.' }).default('fleet'),
    ),
    fleets: fleetIdList,
    basis: z.preprocess(
      blankToUndefined,
      z.enum(FLIGHT_BASES, { error: 'The basis is planned, flown or flown-where-available.' }).optional(),
    ),
  })
  .superRefine((v, ctx) => {
    const { from, to } = v;
    if (isCalendarDate(from) && isCalendarDate(to)) {
      if (from > to)
        ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end of the period is before its start.' });
      else if (monthsSpanned(from, to) > MAX_PERIOD_MONTHS)
        ctx.addIssue({
          code: 'custom',
          path: ['to'],
          message: `Compare at most ${MAX_PERIOD_MONTHS} months at a time.`,
        });
    }
    if (typeof v.minFl === 'number' && typeof v.maxFl === 'number' && v.minFl > v.maxFl) {
      ctx.addIssue({ code: 'custom', path: ['maxFl'], message: 'The top of the level band is below its bottom.' });
    }
  });
export type FleetCompareQuery = z.infer<typeof fleetCompareQuerySchema>;
