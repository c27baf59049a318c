import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { getBudgetState, setUsageBudget } from '@/lib/billing/budget';
import { usageBudgetSchema } from '@/lib/validation/billing';
import { forbidden, notFound } from '@/lib/errors';
import { ensureBilling } from '@/lib/billing/trial';

/** The monthly usage budget with this billing period's usage against it. */
export const GET = workspaceRoute<{ slug: string }>('billing:read', async ({ member }) => {
  await ensureBilling({ workspaceId: member.workspace.id });
  const s = await getBudgetState({ workspaceId: member.workspace.id });
  if (!s) throw notFound('This workspace has no billing state yet.');
  return json(s);
});

/** Sets (or clears, with budgetCents null) the budget and whether reaching it stops new billable work. */
export const PUT = workspaceRoute<{ slug: string }>('billing:manage', async ({ member, req, userId, actorLabel }) => {
  const input = await readJson(req, usageBudgetSchema);
  if (userId === null) throw forbidden('Billing changes need a signed-in owner or finance admin.');
  await ensureBilling({ workspaceId: member.workspace.id });
  return json(await setUsageBudget({ workspaceId: member.workspace.id }, { userId, email: actorLabel }, input));
});
