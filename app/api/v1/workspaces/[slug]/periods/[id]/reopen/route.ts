import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { periodJson } from '@/lib/periods/json';
import { reopenPeriod } from '@/lib/periods/service';
import { periodReopenSchema } from '@/lib/validation/periods';

/** Reopens a period in review or signed (owner) with a required `{ reason }`; recorded in the audit log. */
export const POST = workspaceRoute<{ slug: string; id: string }>(
  'periods:reopen',
  async ({ req, params, member, principal, userId, actorLabel }) => {
    const body = await readJson(req, periodReopenSchema);
    const name = principal.kind === 'user' ? principal.user.name || principal.user.email : actorLabel;
    const p = await reopenPeriod(
      { workspaceId: member.workspace.id },
      { userId, actor: actorLabel, name },
      params.id,
      body.reason,
    );
    return json(periodJson(member.workspace.slug, p));
  },
);
