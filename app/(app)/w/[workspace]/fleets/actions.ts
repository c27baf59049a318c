'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { requireActionMember } from '@/lib/auth/guards';
import { createFleet, deleteFleet, setAircraftTypeFleet, updateFleet } from '@/db/fleets';
import { aircraftFleetSchema, fleetCreateSchema, fleetUpdateSchema } from '@/lib/validation/fleets';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';

const idSchema = z.object({ id: z.coerce.number().int().positive() });

export async function createFleetAction(slug: string, raw: unknown): Promise<ActionState<{ id: number }>> {
  try {
    const ctx = await requireActionMember(slug, 'fleets:write');
    const parsed = fleetCreateSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const fleet = await createFleet({ workspaceId: ctx.workspace.id }, { ...parsed.data, actor: ctx.user.email, userId: ctx.user.id });
    revalidatePath(`/w/${slug}/fleets`);
    return { ok: true, data: { id: fleet.id }, message: `Fleet “${fleet.name}” created.` };
  } catch (err) {
    return toActionState(err);
  }
}

export async function updateFleetAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'fleets:write');
    const id = idSchema.safeParse(raw);
    if (!id.success) throw fromZod(id.error);
    const { id: _id, ...rest } = (raw ?? {}) as Record<string, unknown>;
    const parsed = fleetUpdateSchema.safeParse(rest);
    if (!parsed.success) throw fromZod(parsed.error);
    const fleet = await updateFleet({ workspaceId: ctx.workspace.id }, id.data.id, { ...parsed.data, actor: ctx.user.email, userId: ctx.user.id });
    revalidatePath(`/w/${slug}/fleets`);
    return { ok: true, message: `Saved “${fleet.name}”.` };
  } catch (err) {
    return toActionState(err);
  }
}

export async function deleteFleetAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'fleets:write');
    const parsed = idSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await deleteFleet({ workspaceId: ctx.workspace.id }, parsed.data.id, { actor: ctx.user.email, userId: ctx.user.id });
    revalidatePath(`/w/${slug}/fleets`);
    return { ok: true, message: 'Fleet deleted.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function assignAircraftFleetAction(slug: string, raw: unknown): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'fleets:write');
    const parsed = aircraftFleetSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await setAircraftTypeFleet({ workspaceId: ctx.workspace.id }, { ...parsed.data, actor: ctx.user.email, userId: ctx.user.id });
    revalidatePath(`/w/${slug}/fleets`);
    return { ok: true, message: 'Default fleet changed.' };
  } catch (err) {
    return toActionState(err);
  }
}
