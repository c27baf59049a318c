import { json, workspaceRoute } from '@/lib/api/handler';
import { periodJson } from '@/lib/periods/json';
import { reviewPeriod } from '@/lib/periods/service';

/** Moves an open period to review and freezes its figures (409 when not open or flights are still screening). */
export const POST = workspaceRoute<{ slug: string; id: string }>(
  'periods:review',
  async ({ params, member, principal, userId, actorLabel }) => {
    const user = principal.kind === 'user' ? principal.user : null;
    const p = await reviewPeriod(
      { workspaceId: member.workspace.id },
      { userId, actor: actorLabel, name: user ? user.name || user.email : actorLabel },
      params.id,
      { slug: member.workspace.slug, workspaceName: member.workspace.name, units: user?.units ?? 'metric' },
    );
    return json(periodJson(member.workspace.slug, p));
  },
);
