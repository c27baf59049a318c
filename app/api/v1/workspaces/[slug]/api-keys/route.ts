import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { listApiKeys } from '@/db/api-keys';
import { createApiKey } from '@/lib/auth/api-keys';
import { apiKeyCreateSchema } from '@/lib/validation/workspaces';
import { forbidden } from '@/lib/errors';

export const GET = workspaceRoute<{ slug: string }>('apikeys:manage', async ({ member }) => {
  const keys = await listApiKeys({ workspaceId: member.workspace.id });
  return json({
    items: keys.map(({ id, name, role, prefix, createdAt, lastUsedAt }) => ({
      id,
      name,
      role,
      prefix,
      createdAt,
      lastUsedAt,
    })),
  });
});

/** 201 `{ id, name, role, key }`; the key is shown this once and stored hashed. */
export const POST = workspaceRoute<{ slug: string }>(
  'apikeys:manage',
  async ({ req, member, principal, actorLabel }) => {
    if (principal.kind !== 'user') throw forbidden('An API key cannot create other keys.');
    const input = await readJson(req, apiKeyCreateSchema);
    const k = await createApiKey(
      { workspaceId: member.workspace.id },
      { name: input.name, role: input.role, createdBy: principal.user.id, actor: actorLabel },
    );
    return json({ id: k.id, name: k.name, role: k.role, key: k.key, prefix: k.prefix, createdAt: k.createdAt }, 201);
  },
);
