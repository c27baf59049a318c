import { json, readJson, readQuery, workspaceRoute } from '@/lib/api/handler';
import { listScreenings } from '@/db/screenings';
import { createScreening } from '@/lib/screening-service/saved';
import { parseScreeningBody, runScreening } from '@/lib/screening-service/service';
import { screeningListQuerySchema } from '@/lib/validation/screening-api';
import { invalidFields } from '@/lib/errors';
import { z } from 'zod';
import { bodyFingerprint } from '@/lib/api/fingerprint';
import { checkBudgetAlerts } from '@/lib/billing/budget';

/** Screens and saves one flight: 201 `{ id, name, createdAt, input, result }`, one billable unit. */
export const POST = workspaceRoute<{ slug: string }>('screenings:create', async ({ req, member, principal }) => {
  const raw = await readJson(req, z.unknown());
  const key = req.headers.get('idempotency-key')?.trim() || null;
  if (key && key.length > 255)
    throw invalidFields([
      { path: 'Idempotency-Key', message: 'The Idempotency-Key header must be at most 255 characters.' },
    ]);
  const parsed = await parseScreeningBody(raw, { workspaceId: member.workspace.id });
  const result = runScreening(parsed.input, parsed.library, parsed.aircraftCode);
  const { record, replayed } = await createScreening(
    { workspaceId: member.workspace.id },
    {
      name: parsed.name,
      aircraftCode: parsed.aircraftCode,
      screening: parsed.input,
      result,
      createdBy: principal.kind === 'user' ? principal.user.id : null,
      apiKeyId: principal.kind === 'key' ? principal.key.keyId : null,
      idempotencyKey: key,
      idempotencyFingerprint: key ? bodyFingerprint(raw) : null,
    },
  );
  if (!replayed) await checkBudgetAlerts({ workspaceId: member.workspace.id });
  const body = {
    id: record.id,
    name: record.name,
    createdAt: record.createdAt,
    aircraft: record.aircraftCode,
    input: record.input,
    result: record.result,
  };
  return json(body, replayed ? 200 : 201, replayed ? { 'idempotent-replayed': 'true' } : undefined);
});

/** `{ items, nextCursor }`, newest first. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const query = readQuery(req, screeningListQuerySchema);
  const { cursor, limit, ...filters } = query;
  return json(await listScreenings({ workspaceId: member.workspace.id }, { cursor, limit, filters }));
});
