'use server';

import { revalidatePath } from 'next/cache';
import { workspaceAction } from '@/lib/actions/workspace-action';
import { checkTargetAlerts } from '@/lib/periods/alerts';
import { createCustomPeriod, reopenPeriod, reviewPeriod, setPeriodTargets, signPeriod } from '@/lib/periods/service';
import {
  periodActionSchema,
  periodCreateSchema,
  periodReopenActionSchema,
  periodSignActionSchema,
  periodTargetsActionSchema,
} from '@/lib/validation/periods';

const actorOf = (ctx: { user: { id: number; email: string; name: string | null } }) => ({
  userId: ctx.user.id,
  actor: ctx.user.email,
  name: ctx.user.name || ctx.user.email,
});

export const createPeriodAction = workspaceAction('periods:define', periodCreateSchema, async (ctx, input) => {
  const p = await createCustomPeriod({ workspaceId: ctx.workspace.id }, actorOf(ctx), input);
  revalidatePath(`/w/${ctx.slug}/periods`);
  return { data: { ref: p.ref }, message: `Period “${p.name}” created.` };
});

export const setPeriodTargetsAction = workspaceAction(
  'targets:write',
  periodTargetsActionSchema,
  async (ctx, input) => {
    const scope = { workspaceId: ctx.workspace.id };
    await setPeriodTargets(scope, actorOf(ctx), input.period, input.targets);
    await checkTargetAlerts(scope);
    revalidatePath(`/w/${ctx.slug}/periods/${input.period}`);
    return { message: 'Targets saved.' };
  },
);

export const reviewPeriodAction = workspaceAction('periods:review', periodActionSchema, async (ctx, input) => {
  const p = await reviewPeriod({ workspaceId: ctx.workspace.id }, actorOf(ctx), input.period, {
    slug: ctx.slug,
    workspaceName: ctx.workspace.name,
    units: ctx.user.units,
  });
  revalidatePath(`/w/${ctx.slug}/periods`);
  return { message: `${p.name} is in review: its figures are frozen.` };
});

export const signPeriodAction = workspaceAction('periods:sign', periodSignActionSchema, async (ctx, input) => {
  const p = await signPeriod({ workspaceId: ctx.workspace.id }, actorOf(ctx), input.period, { hash: input.hash });
  revalidatePath(`/w/${ctx.slug}/periods`);
  return { message: `${p.name} signed.` };
});

export const reopenPeriodAction = workspaceAction('periods:reopen', periodReopenActionSchema, async (ctx, input) => {
  const p = await reopenPeriod({ workspaceId: ctx.workspace.id }, actorOf(ctx), input.period, input.reason);
  revalidatePath(`/w/${ctx.slug}/periods`);
  return { message: `${p.name} reopened.` };
});
