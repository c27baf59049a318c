'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember } from '@/lib/auth/guards';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';
import { changePlan, payOpenInvoices, setCancelAtPeriodEnd, setPaymentCard, subscribeWorkspace, updateBillingEmail } from '@/lib/billing/service';
import { PLANS } from '@/lib/billing/plans';
import { TEST_CARDS } from '@/lib/billing/cards';
import { billingEmailSchema, cardChoiceSchema, planChoiceSchema, subscribeSchema, usageBudgetSchema } from '@/lib/validation/billing';
import { setUsageBudget } from '@/lib/billing/budget';
import { formatUsd } from '@/lib/billing/plans';
import { z } from 'zod';

const page = (slug: string) => `/w/${slug}/settings/billing`;

const actorOf = (ctx: { user: { id: number; email: string } }) => ({ userId: ctx.user.id, email: ctx.user.email });

export async function subscribeAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'billing:manage');
    const actor = actorOf(ctx);
    const parsed = subscribeSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const billing = await subscribeWorkspace(ctx.workspace, actor, parsed.data);
    revalidatePath(page(slug));
    const plan = PLANS[parsed.data.planId].name;
    return {
      ok: true,
      message: billing.status === 'trialing' ? `Subscribed to ${plan}. The rest of the free trial stays free.` : `Subscribed to ${plan}. Screening is open.`,
    };
  } catch (err) {
    return toActionState(err);
  }
}

export async function changePlanAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'billing:manage');
    const actor = actorOf(ctx);
    const parsed = planChoiceSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const { changed } = await changePlan(ctx.workspace, actor, parsed.data.planId);
    revalidatePath(page(slug));
    const plan = PLANS[parsed.data.planId].name;
    return { ok: true, message: changed ? `Plan changed to ${plan}. It applies to the whole current period.` : `The workspace is already on ${plan}.` };
  } catch (err) {
    return toActionState(err);
  }
}

const cancelSchema = z.object({ cancel: z.boolean({ error: 'Say whether to cancel or resume.' }) });

export async function cancelAtPeriodEndAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'billing:manage');
    const actor = actorOf(ctx);
    const parsed = cancelSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await setCancelAtPeriodEnd(ctx.workspace, actor, parsed.data.cancel);
    revalidatePath(page(slug));
    return { ok: true, message: parsed.data.cancel ? 'The subscription ends with the current period.' : 'The subscription continues.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function setCardAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'billing:manage');
    const actor = actorOf(ctx);
    const parsed = cardChoiceSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await setPaymentCard(ctx.workspace, actor, parsed.data.card);
    revalidatePath(page(slug));
    return { ok: true, message: `${TEST_CARDS[parsed.data.card].label} is on file for the next invoices.` };
  } catch (err) {
    return toActionState(err);
  }
}

export async function payOpenInvoicesAction(slug: string): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'billing:manage');
    const actor = actorOf(ctx);
    const { paid } = await payOpenInvoices(ctx.workspace, actor);
    revalidatePath(page(slug));
    return { ok: true, message: paid > 0 ? 'Paid. Screening and imports are open again.' : 'There was no open invoice to pay.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function updateBillingEmailAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'billing:manage');
    const actor = actorOf(ctx);
    const parsed = billingEmailSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const email = parsed.data.billingEmail === '' ? null : parsed.data.billingEmail;
    await updateBillingEmail(ctx.workspace, actor, email);
    revalidatePath(page(slug));
    return { ok: true, message: email ? `Billing e-mail set to ${email}.` : 'Billing e-mail cleared; owners and finance admins still hear about payment problems.' };
  } catch (err) {
    return toActionState(err);
  }
}

/** Sets or clears the monthly usage budget and its hard stop. */
export async function setUsageBudgetAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'billing:manage');
    const parsed = usageBudgetSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const s = await setUsageBudget({ workspaceId: ctx.workspace.id }, actorOf(ctx), parsed.data);
    revalidatePath(page(slug));
    return {
      ok: true,
      message:
        s.budgetCents === null
          ? 'Usage budget cleared.'
          : `Usage budget set to ${formatUsd(s.budgetCents)} a billing period${s.hardStop ? ', with a hard stop' : ''}. Alerts go to the billing contacts at 80 % and 100 %.`,
    };
  } catch (err) {
    return toActionState(err);
  }
}
