import { z } from 'zod';

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date as YYYY-MM-DD.');
const share = z.coerce
  .number({ error: 'Give a share between 0 and 1.' })
  .min(0, 'Give a share between 0 and 1.')
  .max(1, 'Give a share between 0 and 1.');

/** Query string of `GET .../screenings`. */
export const screeningListQuerySchema = z.object({
  cursor: z.coerce.number({ error: 'The cursor must be a number from a previous page.' }).int().positive().optional(),
  limit: z.coerce
    .number({ error: 'The limit must be a number.' })
    .int()
    .min(1, 'The limit is 1-200.')
    .max(200, 'The limit is 1-200.')
    .optional(),
  from: day.optional(),
  to: day.optional(),
  route: z.string().max(60).optional(),
  aircraft: z.string().max(16).optional(),
  minShareAbove: share.optional(),
  maxShareAbove: share.optional(),
});

/** Query string of `GET /atmosphere`: exactly one of the two. */
export const atmosphereQuerySchema = z
  .object({
    flightLevel: z.coerce
      .number({ error: 'The flight level must be a number.' })
      .min(-16, 'The flight level must be between -16 and 1049.')
      .max(1049, 'The flight level must be between -16 and 1049.')
      .optional(),
    altitudeM: z.coerce
      .number({ error: 'The altitude must be a number.' })
      .min(-500, 'The altitude must be between -500 and 32000 m.')
      .max(32_000, 'The altitude must be between -500 and 32000 m.')
      .optional(),
  })
  .superRefine((q, ctx) => {
    if ((q.flightLevel === undefined) === (q.altitudeM === undefined)) {
      ctx.addIssue({
        code: 'custom',
        path: ['flightLevel'],
        message: 'Give either flightLevel or altitudeM, not both.',
      });
    }
  });

export const airportQuerySchema = z.object({
  q: z
    .string({ error: 'Type at least one character.' })
    .trim()
    .min(1, 'Type at least one character.')
    .max(60, 'Use at most 60 characters.'),
  limit: z.coerce.number().int().min(1).max(20).optional(),
});
