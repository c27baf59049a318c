import { z } from 'zod';
import { hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE } from './display-text';
import { isoDateSchema, MAX_PERIOD_MONTHS, monthsSpanned } from './fleets';

/** What a target measures, in the unit its value is given in. */
export const TARGET_METRICS = ['noxAboveT', 'shareAbovePct', 'noxAbovePer1000KmKg'] as const;
export type TargetMetric = (typeof TARGET_METRICS)[number];

export const TARGET_METRIC_LABELS: Record<TargetMetric, { label: string; unit: string }> = {
  noxAboveT: { label: 'NOx above the tropopause', unit: 't' },
  shareAbovePct: { label: 'Share above', unit: '%' },
  noxAbovePer1000KmKg: { label: 'NOx above per 1000 km', unit: 'kg' },
};

/** `2026`, `2026-Q4`, `2026-11` or a custom period's `c12`. */
export const periodRefSchema = z
  .string({ error: 'Choose a period.' })
  .trim()
  .regex(/^(\d{4}(-Q[1-4]|-(0[1-9]|1[0-2]))?|c\d{1,10})$/, 'Choose a period (e.g. 2026-Q4, 2026-11, 2026).');

export const periodCreateSchema = z
  .object({
    name: z
      .string({ error: 'Give the period a name.' })
      .trim()
      .min(1, 'Give the period a name.')
      .max(120, 'Use at most 120 characters.')
      .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE),
    from: isoDateSchema,
    to: isoDateSchema,
  })
  .superRefine((v, ctx) => {
    if (v.from > v.to) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end is before the start.' });
    else if (monthsSpanned(v.from, v.to) > MAX_PERIOD_MONTHS)
      ctx.addIssue({ code: 'custom', path: ['to'], message: `A period covers at most ${MAX_PERIOD_MONTHS} months.` });
  });
export type PeriodCreate = z.infer<typeof periodCreateSchema>;

const targetSchema = z.object({
  fleetId: z
    .number({ error: 'Give a fleet id, or null for the whole workspace.' })
    .int('Choose a fleet from the list.')
    .positive('Choose a fleet from the list.')
    .max(2_147_483_647, 'Choose a fleet from the list.')
    .nullable(),
  metric: z.enum(TARGET_METRICS, { error: `Choose one of ${TARGET_METRICS.join(', ')}.` }),
  value: z
    .number({ error: 'Give the target as a number.' })
    .positive('A target is above zero.')
    .max(1e12, 'That target is too large.'),
});

const targetListSchema = z.array(targetSchema, { error: 'List the targets.' }).max(60, 'At most 60 targets a period.');

function checkTargets(v: { targets: z.infer<typeof targetListSchema> }, ctx: z.RefinementCtx): void {
  const seen = new Set<string>();
  v.targets.forEach((t, i) => {
    const k = `${t.fleetId ?? 0}:${t.metric}`;
    if (seen.has(k))
      ctx.addIssue({ code: 'custom', path: ['targets', i, 'metric'], message: 'This target is listed twice.' });
    seen.add(k);
    if (t.metric === 'shareAbovePct' && t.value > 100)
      ctx.addIssue({ code: 'custom', path: ['targets', i, 'value'], message: 'A share is at most 100 %.' });
  });
}

/** The whole set of a period's targets; what is left out is removed. */
export const periodTargetsSchema = z.object({ targets: targetListSchema }).superRefine(checkTargets);
export type PeriodTargets = z.infer<typeof periodTargetsSchema>;

export const periodSignSchema = z.object({
  /** When given, the hash the signer saw: signing refuses if the frozen figures hash differently. */
  hash: z
    .string()
    .regex(/^[0-9a-f]{64}$/, 'A SHA-256 hash is 64 hexadecimal characters.')
    .optional(),
});

export const periodReopenSchema = z.object({
  reason: z
    .string({ error: 'Say why the period is reopened.' })
    .trim()
    .min(5, 'Say why the period is reopened (at least 5 characters).')
    .max(1000, 'Use at most 1000 characters.')
    .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE),
});

// Server actions take the period with their input, so an empty input is invalid for every one.
export const periodActionSchema = z.object({ period: periodRefSchema });
export const periodSignActionSchema = periodActionSchema.extend(periodSignSchema.shape);
export const periodReopenActionSchema = periodActionSchema.extend(periodReopenSchema.shape);
export const periodTargetsActionSchema = z
  .object({ period: periodRefSchema, targets: targetListSchema })
  .superRefine(checkTargets);
