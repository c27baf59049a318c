import { z } from 'zod';

const slug = z
  .string({ error: 'Choose a workspace.' })
  .trim()
  .min(1, 'Choose a workspace.')
  .max(64, 'Choose a workspace.');

/** Copy the engine and aircraft-type library (and fleet definitions) from one workspace to another. */
export const libraryCopySchema = z
  .object({
    from: slug,
    to: slug,
    engines: z.boolean().default(true),
    aircraftTypes: z.boolean().default(true),
    fleets: z.boolean().default(false),
  })
  .superRefine((v, ctx) => {
    if (v.from === v.to)
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'Choose a different workspace to copy into.' });
    if (!v.engines && !v.aircraftTypes && !v.fleets)
      ctx.addIssue({
        code: 'custom',
        path: ['engines'],
        message: 'Choose at least one of engines, aircraft types or fleets.',
      });
  });
export type LibraryCopyInput = z.infer<typeof libraryCopySchema>;
