import { json, readBodyText, workspaceRoute } from '@/lib/api/handler';
import { badRequest, fromZod } from '@/lib/errors';
import { periodJson } from '@/lib/periods/json';
import { signPeriod } from '@/lib/periods/service';
import { periodSignSchema } from '@/lib/validation/periods';

/** Signs a period in review (owner); an optional `{ hash }` must be the frozen figures' SHA-256. */
export const POST = workspaceRoute<{ slug: string; id: string }>(
  'periods:sign',
  async ({ req, params, member, principal, userId, actorLabel }) => {
    const text = await readBodyText(req);
    let raw: unknown = {};
    if (text.trim()) {
      try {
        raw = JSON.parse(text);
      } catch {
        throw badRequest('The request body is not valid JSON.');
      }
    }
    const body = periodSignSchema.safeParse(raw);
    if (!body.success) throw fromZod(body.error);
    const name = principal.kind === 'user' ? principal.user.name || principal.user.email : actorLabel;
    const p = await signPeriod(
      { workspaceId: member.workspace.id },
      { userId, actor: actorLabel, name },
      params.id,
      body.data,
    );
    return json(periodJson(member.workspace.slug, p));
  },
);
