import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { periodJson } from '@/lib/periods/json';
import { createCustomPeriod, listPeriods } from '@/lib/periods/service';
import { periodCreateSchema } from '@/lib/validation/periods';

/** The calendar periods of every year with flights (and this year), then the custom periods. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  const slug = member.workspace.slug;
  const list = await listPeriods({ workspaceId: member.workspace.id });
  return json({
    years: list.years.map((y) => ({ year: y.year, periods: y.periods.map((p) => periodJson(slug, p)) })),
    custom: list.custom.map((p) => periodJson(slug, p)),
  });
});

/** A custom period `{ name, from, to }` (owner): 201 with the period. */
export const POST = workspaceRoute<{ slug: string }>(
  'periods:define',
  async ({ req, member, principal, userId, actorLabel }) => {
    const body = await readJson(req, periodCreateSchema);
    const name = principal.kind === 'user' ? principal.user.name || principal.user.email : actorLabel;
    const p = await createCustomPeriod({ workspaceId: member.workspace.id }, { userId, actor: actorLabel, name }, body);
    return json(periodJson(member.workspace.slug, p), 201);
  },
);
