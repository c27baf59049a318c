import 'server-only';
import { requestImportRescreen, type ImportDto } from '@/db/imports';
import { ENGINE_VERSION } from '@/lib/screening';
import { queueImportWork } from './jobs';

/**
 * Queues a background re-screen of an import's flights with the current engine version. No billing
 * gate and no usage unit: the flights were billed once, when first screened (see saveRescreenChunk).
 */
export async function rescreenImport(
  scope: { workspaceId: number },
  id: number,
  actor: { userId: number | null; label: string },
): Promise<ImportDto> {
  const imp = await requestImportRescreen(scope, id, {
    engineVersion: ENGINE_VERSION,
    requestedBy: actor.userId,
    actor: actor.label,
  });
  await queueImportWork('rescreen', { importId: imp.id, workspaceId: scope.workspaceId });
  return imp;
}
