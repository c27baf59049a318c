import { idParam, json, workspaceRoute } from '@/lib/api/handler';
import { rescreenScreening } from '@/lib/screening-service/service';

/**
 * Screens a saved screening again with the current engine as a new screening (not billed): 201 the
 * new screening, 200 the one already made for this engine version, 409 when it is already current.
 */
export const POST = workspaceRoute<{ slug: string; id: string }>(
  'screenings:create',
  async ({ params, member, principal }) => {
    const { record, replayed } = await rescreenScreening({ workspaceId: member.workspace.id }, idParam(params.id), {
      userId: principal.kind === 'user' ? principal.user.id : null,
      apiKeyId: principal.kind === 'key' ? principal.key.keyId : null,
    });
    const body = {
      id: record.id,
      name: record.name,
      createdAt: record.createdAt,
      aircraft: record.aircraftCode,
      engineVersion: record.engineVersion,
      rescreenOf: record.rescreenOf,
      input: record.input,
      result: record.result,
    };
    return json(body, replayed ? 200 : 201);
  },
);
