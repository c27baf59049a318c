import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { checkTargetAlerts } from '@/lib/periods/alerts';
import { getPeriodView, setPeriodTargets } from '@/lib/periods/service';
import { periodTargetsSchema } from '@/lib/validation/periods';

/** Replaces the period's targets `{ targets: [{ fleetId | null, metric, value }] }`; open periods only (409). */
export const PUT = workspaceRoute<{ slug: string; id: string }>(
  'targets:write',
  async ({ req, params, member, principal, userId, actorLabel }) => {
    const body = await readJson(req, periodTargetsSchema);
    const scope = { workspaceId: member.workspace.id };
    const name = principal.kind === 'user' ? principal.user.name || principal.user.email : actorLabel;
    await setPeriodTargets(scope, { userId, actor: actorLabel, name }, params.id, body.targets);
    await checkTargetAlerts(scope);
    const view = await getPeriodView(scope, params.id, { flightLimit: 1 });
    return json({ targets: view.targets });
  },
);
