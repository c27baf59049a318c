import { json, workspaceRoute } from '@/lib/api/handler';
import { getUsageSummary } from '@/lib/billing/usage-summary';

/** The current period's metered usage, estimate and ledger-versus-provider reconciliation. */
export const GET = workspaceRoute<{ slug: string }>('usage:read', async ({ member }) => {
  return json(await getUsageSummary({ workspaceId: member.workspace.id }));
});
