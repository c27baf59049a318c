import { z } from 'zod';
import { isCalendarDate, isoDateSchema, MAX_PERIOD_MONTHS, monthsSpanned } from './fleets';
import { hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE } from './display-text';

export const MAX_RECIPIENTS = 20;

export const reportCreateSchema = z
  .object({
    name: z
      .string({ error: 'The name must be text.' })
      .trim()
      .max(160, 'Use at most 160 characters.')
      .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE)
      .optional(),
    from: isoDateSchema,
    to: isoDateSchema,
    fleetIds: z
      .array(
        z.coerce.number({ error: 'Choose fleets from the list.' }).int().positive('Choose fleets from the list.'),
        { error: 'Choose at least one fleet.' },
      )
      .min(1, 'Choose at least one fleet.')
      .max(50, 'A report covers at most 50 fleets.'),
  })
  .superRefine((v, ctx) => {
    if (Array.isArray(v.fleetIds) && new Set(v.fleetIds).size !== v.fleetIds.length)
      ctx.addIssue({ code: 'custom', path: ['fleetIds'], message: 'A fleet is listed twice.' });
    const { from, to } = v;
    if (!isCalendarDate(from) || !isCalendarDate(to)) return;
    if (from > to)
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end of the period is before its start.' });
    else if (monthsSpanned(from, to) > MAX_PERIOD_MONTHS)
      ctx.addIssue({ code: 'custom', path: ['to'], message: `A report covers at most ${MAX_PERIOD_MONTHS} months.` });
  });
export type ReportCreate = z.infer<typeof reportCreateSchema>;

const recipientSchema = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: 'Enter a valid e-mail address, such as name@example.com.' }));

export const reportSendSchema = z
  .object({
    recipients: z
      .array(recipientSchema, { error: 'List the recipients’ e-mail addresses.' })
      .min(1, 'Enter at least one e-mail address.')
      .max(MAX_RECIPIENTS, `Send to at most ${MAX_RECIPIENTS} addresses at once.`),
    note: z.string({ error: 'The note must be text.' }).trim().max(1000, 'Use at most 1000 characters.').optional(),
  })
  .superRefine((v, ctx) => {
    const seen = new Set<string>();
    v.recipients.forEach((r, i) => {
      if (seen.has(r)) ctx.addIssue({ code: 'custom', path: ['recipients', i], message: `${r} is listed twice.` });
      seen.add(r);
    });
  });
export type ReportSend = z.infer<typeof reportSendSchema>;

/** Splits what someone typed (commas, semicolons, spaces or new lines) into addresses. */
export function splitRecipients(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((s) => s.trim())
    .filter(Boolean);
}

/**
 * The form's shape: recipients typed in one box. It checks the same rules as `reportSendSchema`
 * and reports them on `recipientsText`.
 */
export const reportSendFormSchema = z
  .object({
    recipientsText: z.string({ error: 'Enter at least one e-mail address.' }),
    note: z.string().trim().max(1000, 'Use at most 1000 characters.').optional(),
  })
  .superRefine((v, ctx) => {
    const parsed = reportSendSchema.safeParse({ recipients: splitRecipients(v.recipientsText), note: v.note });
    if (parsed.success) return;
    const list = splitRecipients(v.recipientsText);
    for (const issue of parsed.error.issues) {
      if (issue.path[0] !== 'recipients') continue;
      const i = typeof issue.path[1] === 'number' ? issue.path[1] : undefined;
      const message =
        i !== undefined && issue.code !== 'custom' ? `“${list[i]}” is not a valid e-mail address.` : issue.message;
      ctx.addIssue({ code: 'custom', path: ['recipientsText'], message });
      return;
    }
  });
export type ReportSendForm = z.infer<typeof reportSendFormSchema>;
