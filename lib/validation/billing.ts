import { z } from 'zod';
import { CARD_CHOICES } from '@/lib/billing/cards';
import { PLAN_IDS, type PlanId } from '@/lib/billing/plans';

const planIds = PLAN_IDS as readonly [PlanId, ...PlanId[]];

export const planChoiceSchema = z.object({
  planId: z.enum(planIds, { error: 'Choose a plan.' }),
});
export type PlanChoice = z.infer<typeof planChoiceSchema>;

export const cardChoiceSchema = z.object({
  card: z.enum(CARD_CHOICES, { error: 'Choose a card.' }),
});
export type CardChoiceInput = z.infer<typeof cardChoiceSchema>;

export const subscribeSchema = planChoiceSchema.extend(cardChoiceSchema.shape);
export type SubscribeInput = z.infer<typeof subscribeSchema>;

export const billingEmailSchema = z.object({
  billingEmail: z
    .string({ error: 'Enter an e-mail address, or leave it empty.' })
    .trim()
    .max(254, 'Use at most 254 characters.')
    .refine((v) => v === '' || z.email().safeParse(v).success, 'Enter a valid e-mail address, or leave it empty.'),
});
export type BillingEmailInput = z.infer<typeof billingEmailSchema>;

export const subscriptionUpdateSchema = z
  .object({
    planId: z.enum(planIds, { error: 'Choose a plan.' }).optional(),
    cancelAtPeriodEnd: z
      .boolean({ error: 'Use true to cancel at the end of the period, false to keep the subscription.' })
      .optional(),
  })
  .refine((v) => v.planId !== undefined || v.cancelAtPeriodEnd !== undefined, {
    message: 'Send planId, cancelAtPeriodEnd or both.',
    path: ['planId'],
  });
export type SubscriptionUpdateInput = z.infer<typeof subscriptionUpdateSchema>;

/** A monthly usage budget in whole cents of per-flight charges (null clears it), and its hard stop. */
export const usageBudgetSchema = z.object({
  budgetCents: z
    .number({ error: 'The budget must be a number of cents, or null for no budget.' })
    .int('The budget is a whole number of cents.')
    .min(0, 'The budget cannot be negative.')
    .max(100_000_000_00, 'The budget is at most $100,000,000.')
    .nullable(),
  hardStop: z.boolean({ error: 'hardStop must be true or false.' }).default(false),
});
export type UsageBudgetInput = z.infer<typeof usageBudgetSchema>;
