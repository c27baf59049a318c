'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { createFleet, deleteFleet, setAircraftTypeFleet, updateFleet } from '@/db/fleets';
import { aircraftFleetSchema, fleetCreateSchema, fleetUpdateSchema } from '@/lib/validation/fleets';
import { workspaceAction } from '@/lib/actions/workspace-action';

const idSchema = z.object({ id: z.coerce.number().int().positive() });
const fleetEditSchema = idSchema.and(fleetUpdateSchema);

export const createFleetAction = workspaceAction('fleets:write', fleetCreateSchema, async (ctx, input) => {
  const fleet = await createFleet(
    { workspaceId: ctx.workspace.id },
    { ...input, actor: ctx.user.email, userId: ctx.user.id },
  );
  revalidatePath(`/w/${ctx.slug}/fleets`);
  return { data: { id: fleet.id }, message: `Fleet “${fleet.name}” created.` };
});

export const updateFleetAction = workspaceAction('fleets:write', fleetEditSchema, async (ctx, { id, ...changes }) => {
  const fleet = await updateFleet({ workspaceId: ctx.workspace.id }, id, {
    ...changes,
    actor: ctx.user.email,
    userId: ctx.user.id,
  });
  revalidatePath(`/w/${ctx.slug}/fleets`);
  return { message: `Saved “${fleet.name}”.` };
});

export const deleteFleetAction = workspaceAction('fleets:write', idSchema, async (ctx, { id }) => {
  await deleteFleet({ workspaceId: ctx.workspace.id }, id, { actor: ctx.user.email, userId: ctx.user.id });
  revalidatePath(`/w/${ctx.slug}/fleets`);
  return { message: 'Fleet deleted.' };
});

export const assignAircraftFleetAction = workspaceAction('fleets:write', aircraftFleetSchema, async (ctx, input) => {
  await setAircraftTypeFleet(
    { workspaceId: ctx.workspace.id },
    { ...input, actor: ctx.user.email, userId: ctx.user.id },
  );
  revalidatePath(`/w/${ctx.slug}/fleets`);
  return { message: 'Default fleet changed.' };
});
