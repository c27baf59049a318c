'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember, requireActionUser } from '@/lib/auth/guards';
import { copyLibrary, type LibraryCopyResult } from '@/db/library-copy';
import { libraryCopySchema } from '@/lib/validation/library-copy';
import { createWorkspace } from '@/db/workspaces';
import { workspaceCreateSchema } from '@/lib/validation/workspaces';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';

export async function createWorkspaceAction(raw: unknown): Promise<ActionState<{ slug: string }>> {
  try {
    const user = await requireActionUser();
    const parsed = workspaceCreateSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const ws = await createWorkspace({ name: parsed.data.name, slug: parsed.data.slug, ownerId: user.id, actor: user.email });
    return { ok: true, data: { slug: ws.slug } };
  } catch (err) {
    return toActionState(err);
  }
}

/**
 * Copies the engine and aircraft-type library (and fleet definitions) from one workspace to another;
 * the caller must be allowed to copy libraries (an owner) in both.
 */
export async function copyLibraryAction(raw: unknown): Promise<ActionState<LibraryCopyResult>> {
  try {
    await requireActionUser();
    const parsed = libraryCopySchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const source = await requireActionMember(parsed.data.from, 'library:copy');
    const target = await requireActionMember(parsed.data.to, 'library:copy');
    const r = await copyLibrary(
      { fromWorkspaceId: source.workspace.id, toWorkspaceId: target.workspace.id, include: { engines: parsed.data.engines, aircraftTypes: parsed.data.aircraftTypes, fleets: parsed.data.fleets } },
      { userId: target.user.id, label: target.user.email },
    );
    revalidatePath(`/w/${target.workspace.slug}/engines`);
    revalidatePath(`/w/${target.workspace.slug}/fleets`);
    const part = (label: string, p: { copied: string[]; skipped: string[] }) => `${p.copied.length} ${label} copied${p.skipped.length ? ` (${p.skipped.length} already there, kept)` : ''}`;
    return {
      ok: true,
      data: r,
      message: `From ${source.workspace.name} to ${target.workspace.name}: ${[part('engines', r.engines), part('aircraft types', r.aircraftTypes), part('fleets', r.fleets)].join('; ')}.`,
    };
  } catch (err) {
    return toActionState(err);
  }
}
