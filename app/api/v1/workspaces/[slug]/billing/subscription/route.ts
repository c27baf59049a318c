import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { ensureBilling } from '@/lib/billing/trial';
import { changePlan, setCancelAtPeriodEnd, subscribeWorkspace } from '@/lib/billing/service';
import { publicBillingState } from '@/lib/billing/state';
import { subscribeSchema, subscriptionUpdateSchema } from '@/lib/validation/billing';
import { forbidden } from '@/lib/errors';

const actorOf = (userId: number | null, actorLabel: string) => {
  if (userId === null) throw forbidden('Billing changes need a signed-in owner or finance admin.');
  return { userId, email: actorLabel };
};

/** Subscribe (from a trial or after a cancellation) to a plan, with a test card on file. */
export const POST = workspaceRoute<{ slug: string }>('billing:manage', async ({ member, req, userId, actorLabel }) => {
  const input = await readJson(req, subscribeSchema);
  const billing = await subscribeWorkspace(member.workspace, actorOf(userId, actorLabel), input);
  return json(publicBillingState(billing), 201);
});

/** Change plan and/or cancel at the end of the period (cancelAtPeriodEnd: true) or resume (false). */
export const PATCH = workspaceRoute<{ slug: string }>('billing:manage', async ({ member, req, userId, actorLabel }) => {
  const input = await readJson(req, subscriptionUpdateSchema);
  const actor = actorOf(userId, actorLabel);
  if (input.planId !== undefined) await changePlan(member.workspace, actor, input.planId);
  if (input.cancelAtPeriodEnd !== undefined)
    await setCancelAtPeriodEnd(member.workspace, actor, input.cancelAtPeriodEnd);
  return json(publicBillingState(await ensureBilling({ workspaceId: member.workspace.id })));
});
