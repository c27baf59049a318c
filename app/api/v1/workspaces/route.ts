import { authedRoute, json, readJson } from '@/lib/api/handler';
import { listWorkspacesForUser } from '@/db/workspaces';
import { createWorkspace } from '@/lib/workspaces/service';
import { workspaceCreateSchema } from '@/lib/validation/workspaces';
import { forbidden } from '@/lib/errors';

/** The caller's workspaces, each `{ slug, name, role }`; an API key sees its own one. */
export const GET = authedRoute(async ({ principal }) => {
  if (principal.kind === 'key') {
    const { workspace, role } = principal.key;
    return json({ items: [{ slug: workspace.slug, name: workspace.name, role }] });
  }
  const rows = await listWorkspacesForUser({ userId: principal.user.id });
  return json({ items: rows.map((m) => ({ slug: m.workspace.slug, name: m.workspace.name, role: m.role })) });
});

/** Creates a workspace; the signed-in creator becomes its owner. */
export const POST = authedRoute(async ({ req, principal }) => {
  if (principal.kind !== 'user') throw forbidden('API keys act inside one workspace and cannot create workspaces.');
  const input = await readJson(req, workspaceCreateSchema);
  const ws = await createWorkspace({
    name: input.name,
    slug: input.slug,
    ownerId: principal.user.id,
    actor: principal.user.email,
  });
  return json({ slug: ws.slug, name: ws.name, role: 'owner' }, 201);
});
