'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import {
  changePlan,
  payOpenInvoices,
  setCancelAtPeriodEnd,
  setPaymentCard,
  subscribeWorkspace,
  updateBillingEmail,
} from '@/lib/billing/service';
import { PLANS } from '@/lib/billing/plans';
import { TEST_CARDS } from '@/lib/billing/cards';
import {
  billingEmailSchema,
  cardChoiceSchema,
  planChoiceSchema,
  subscribeSchema,
  usageBudgetSchema,
} from '@/lib/validation/billing';
import { noInput, workspaceAction, type WorkspaceActionContext } from '@/lib/actions/workspace-action';
import { setUsageBudget } from '@/lib/billing/budget';
import { formatUsd } from '@/lib/billing/plans';

const page = (slug: string) => `/w/${slug}/settings/billing`;

const actorOf = (ctx: WorkspaceActionContext) => ({ userId: ctx.user.id, email: ctx.user.email });

export const subscribeAction = workspaceAction('billing:manage', subscribeSchema, async (ctx, input) => {
  const billing = await subscribeWorkspace(ctx.workspace, actorOf(ctx), input);
  revalidatePath(page(ctx.slug));
  const plan = PLANS[input.planId].name;
  return {
    message:
      billing.status === 'trialing'
        ? `Subscribed to ${plan}. The rest of the free trial stays free.`
        : `Subscribed to ${plan}. Screening is open.`,
  };
});

export const changePlanAction = workspaceAction('billing:manage', planChoiceSchema, async (ctx, { planId }) => {
  const { changed } = await changePlan(ctx.workspace, actorOf(ctx), planId);
  revalidatePath(page(ctx.slug));
  const plan = PLANS[planId].name;
  return {
    message: changed
      ? `Plan changed to ${plan}. It applies to the whole current period.`
      : `The workspace is already on ${plan}.`,
  };
});

const cancelSchema = z.object({ cancel: z.boolean({ error: 'Say whether to cancel or resume.' }) });

export const cancelAtPeriodEndAction = workspaceAction('billing:manage', cancelSchema, async (ctx, { cancel }) => {
  await setCancelAtPeriodEnd(ctx.workspace, actorOf(ctx), cancel);
  revalidatePath(page(ctx.slug));
  return { message: cancel ? 'The subscription ends with the current period.' : 'The subscription continues.' };
});

export const setCardAction = workspaceAction('billing:manage', cardChoiceSchema, async (ctx, { card }) => {
  await setPaymentCard(ctx.workspace, actorOf(ctx), card);
  revalidatePath(page(ctx.slug));
  return { message: `${TEST_CARDS[card].label} is on file for the next invoices.` };
});

export const payOpenInvoicesAction = workspaceAction('billing:manage', noInput, async (ctx) => {
  const { paid } = await payOpenInvoices(ctx.workspace, actorOf(ctx));
  revalidatePath(page(ctx.slug));
  return { message: paid > 0 ? 'Paid. Screening and imports are open again.' : 'There was no open invoice to pay.' };
});

export const updateBillingEmailAction = workspaceAction('billing:manage', billingEmailSchema, async (ctx, input) => {
  const email = input.billingEmail === '' ? null : input.billingEmail;
  await updateBillingEmail(ctx.workspace, actorOf(ctx), email);
  revalidatePath(page(ctx.slug));
  return {
    message: email
      ? `Billing e-mail set to ${email}.`
      : 'Billing e-mail cleared; owners and finance admins still hear about payment problems.',
  };
});

/** Sets or clears the monthly usage budget and its hard stop. */
export const setUsageBudgetAction = workspaceAction('billing:manage', usageBudgetSchema, async (ctx, input) => {
  const s = await setUsageBudget({ workspaceId: ctx.workspace.id }, actorOf(ctx), input);
  revalidatePath(page(ctx.slug));
  return {
    message:
      s.budgetCents === null
        ? 'Usage budget cleared.'
        : `Usage budget set to ${formatUsd(s.budgetCents)} a billing period${s.hardStop ? ', with a hard stop' : ''}. Alerts go to the billing contacts at 80 % and 100 %.`,
  };
});
