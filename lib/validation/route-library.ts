import { z } from 'zod';

/**
 * The fix and airway libraries (DESIGN.md "Import formats": fixes `name, lat, lon, region?`,
 * airways `airway, sequence, fix`). Client-safe.
 */
export const ROUTE_LIBRARY_LIMITS = {
  /** Fixes or airway points in one CSV upload. */
  maxRows: 20_000,
  /** 2 MB of CSV. */
  maxBytes: 2_000_000,
  maxNameChars: 12,
  maxRegionChars: 40,
  /** Points on one airway. */
  maxAirwayFixes: 500,
} as const;

/** A fix or airway name: 2-12 letters and digits, stored upper-case. */
export const navNameSchema = (label: string) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .toUpperCase()
    .regex(new RegExp(`^[A-Z0-9]{2,${ROUTE_LIBRARY_LIMITS.maxNameChars}}$`), {
      error: `${label} has 2 to ${ROUTE_LIBRARY_LIMITS.maxNameChars} letters and digits, such as QXBEL.`,
    });

/** One named point: degrees (WGS-84), optional region to tell same-named points apart. */
export const fixRowSchema = z.strictObject({
  name: navNameSchema('The fix name').refine((n) => !/^\d/.test(n), {
    error: 'A fix name starts with a letter (names that start with a digit read as coordinates).',
  }),
  lat: z
    .number({ error: 'The latitude must be a number.' })
    .min(-90, { error: 'The latitude must be between -90 and 90 degrees.' })
    .max(90, { error: 'The latitude must be between -90 and 90 degrees.' }),
  lon: z
    .number({ error: 'The longitude must be a number.' })
    .min(-180, { error: 'The longitude must be between -180 and 180 degrees.' })
    .max(180, { error: 'The longitude must be between -180 and 180 degrees.' }),
  region: z
    .string()
    .trim()
    .max(ROUTE_LIBRARY_LIMITS.maxRegionChars, {
      error: `A region has at most ${ROUTE_LIBRARY_LIMITS.maxRegionChars} characters.`,
    })
    .optional(),
});
export type FixRow = z.output<typeof fixRowSchema>;

/** One airway: its designator and its fix names in order (at least 2). */
export const airwayRowSchema = z.strictObject({
  name: navNameSchema('The airway designator'),
  fixes: z
    .array(navNameSchema('A fix name'))
    .min(2, { error: 'An airway needs at least 2 points.' })
    .max(ROUTE_LIBRARY_LIMITS.maxAirwayFixes, {
      error: `An airway may have at most ${ROUTE_LIBRARY_LIMITS.maxAirwayFixes} points.`,
    }),
});
export type AirwayRow = z.output<typeof airwayRowSchema>;

/** `GET .../fixes?q=&limit=` and `.../airways?q=&limit=`: name prefix search, at most 500 (default 200). */
export const routeLibraryQuerySchema = z.object({
  q: z
    .string()
    .trim()
    .max(ROUTE_LIBRARY_LIMITS.maxNameChars, {
      error: `Search with at most ${ROUTE_LIBRARY_LIMITS.maxNameChars} characters.`,
    })
    .optional(),
  limit: z.coerce
    .number({ error: 'The limit must be a number.' })
    .int({ error: 'The limit must be a whole number.' })
    .min(1, { error: 'The limit must be 1 to 500.' })
    .max(500, { error: 'The limit must be 1 to 500.' })
    .default(200),
});
