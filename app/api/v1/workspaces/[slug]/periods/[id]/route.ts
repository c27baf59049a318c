import { json, workspaceRoute } from '@/lib/api/handler';
import { periodJson } from '@/lib/periods/json';
import { getPeriodView } from '@/lib/periods/service';

/**
 * One period (`2026-Q4`, `2026-11`, `2026` or a custom `c12`): its state and sign-off, its figures
 * (frozen once in review, else running) against its targets, the trend over the periods before it,
 * the frozen flights (first 200) and the changes after the freeze.
 */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const view = await getPeriodView({ workspaceId: member.workspace.id }, params.id);
  return json({ ...view, period: periodJson(member.workspace.slug, view.period) });
});
