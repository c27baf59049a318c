'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember } from '@/lib/auth/guards';
import { createAircraftType, createEngine, deleteAircraftType, deleteEngine, updateAircraftType, updateEngine } from '@/db/engines';
import { aircraftTypeSaveSchema, engineSaveSchema } from '@/lib/validation/library';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';
import { actionId, optionalActionId } from '@/lib/validation/action-input';

/** Creates (id null) or replaces an engine. */
export async function saveEngineAction(slug: string, id: number | null, raw: unknown): Promise<ActionState<{ id: number }>> {
  try {
    const ctx = await requireActionMember(slug, 'library:write');
    const parsed = engineSaveSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const by = { userId: ctx.user.id, actor: ctx.user.email };
    const scope = { workspaceId: ctx.workspace.id };
    const target = optionalActionId(id);
    const engine = target === null ? await createEngine(scope, parsed.data, by) : await updateEngine(scope, target, parsed.data, by);
    revalidatePath(`/w/${slug}/engines`);
    return { ok: true, data: { id: engine.id }, message: target === null ? `Added “${engine.name}”.` : 'Changes saved.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function deleteEngineAction(slug: string, id: number): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'library:write');
    await deleteEngine({ workspaceId: ctx.workspace.id }, actionId(id), { userId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/engines`);
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}

/** Creates (id null) or replaces an aircraft type. */
export async function saveAircraftTypeAction(slug: string, id: number | null, raw: unknown): Promise<ActionState<{ id: number }>> {
  try {
    const ctx = await requireActionMember(slug, 'library:write');
    const parsed = aircraftTypeSaveSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const by = { userId: ctx.user.id, actor: ctx.user.email };
    const scope = { workspaceId: ctx.workspace.id };
    const target = optionalActionId(id);
    const type = target === null ? await createAircraftType(scope, parsed.data, by) : await updateAircraftType(scope, target, parsed.data, by);
    revalidatePath(`/w/${slug}/engines`);
    return { ok: true, data: { id: type.id }, message: target === null ? `Added aircraft type ${type.code}.` : 'Changes saved.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function deleteAircraftTypeAction(slug: string, id: number): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'library:write');
    await deleteAircraftType({ workspaceId: ctx.workspace.id }, actionId(id), { userId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/engines`);
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}
