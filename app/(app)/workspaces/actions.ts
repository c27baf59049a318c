'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember } from '@/lib/auth/guards';
import { copyLibrary } from '@/db/library-copy';
import { libraryCopySchema } from '@/lib/validation/library-copy';
import { createWorkspace } from '@/lib/workspaces/service';
import { workspaceCreateSchema } from '@/lib/validation/workspaces';
import { userAction } from '@/lib/actions/workspace-action';

export const createWorkspaceAction = userAction(workspaceCreateSchema, async (user, input) => {
  const ws = await createWorkspace({ name: input.name, slug: input.slug, ownerId: user.id, actor: user.email });
  return { data: { slug: ws.slug } };
});

/**
 * Copies the engine and aircraft-type library (and fleet definitions) from one workspace to another;
 * the caller must be allowed to copy libraries (an owner) in both.
 */
export const copyLibraryAction = userAction(libraryCopySchema, async (_user, input) => {
  const source = await requireActionMember(input.from, 'library:copy');
  const target = await requireActionMember(input.to, 'library:copy');
  const r = await copyLibrary(
    {
      fromWorkspaceId: source.workspace.id,
      toWorkspaceId: target.workspace.id,
      include: { engines: input.engines, aircraftTypes: input.aircraftTypes, fleets: input.fleets },
    },
    { userId: target.user.id, label: target.user.email },
  );
  revalidatePath(`/w/${target.workspace.slug}/engines`);
  revalidatePath(`/w/${target.workspace.slug}/fleets`);
  const part = (label: string, p: { copied: string[]; skipped: string[] }) =>
    `${p.copied.length} ${label} copied${p.skipped.length ? ` (${p.skipped.length} already there, kept)` : ''}`;
  return {
    data: r,
    message: `From ${source.workspace.name} to ${target.workspace.name}: ${[part('engines', r.engines), part('aircraft types', r.aircraftTypes), part('fleets', r.fleets)].join('; ')}.`,
  };
});
