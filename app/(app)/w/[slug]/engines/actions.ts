'use server';

import { revalidatePath } from 'next/cache';
import {
  createAircraftType,
  createEngine,
  deleteAircraftType,
  deleteEngine,
  updateAircraftType,
  updateEngine,
} from '@/db/engines';
import { aircraftTypeSaveSchema, engineSaveSchema } from '@/lib/validation/library';
import { noInput, workspaceRowAction } from '@/lib/actions/workspace-action';

/** Creates (id null) or replaces an engine. */
export const saveEngineAction = workspaceRowAction(
  'library:write',
  engineSaveSchema,
  async (ctx, id, input) => {
    const scope = { workspaceId: ctx.workspace.id };
    const engine =
      id === null ? await createEngine(scope, input, ctx.by) : await updateEngine(scope, id, input, ctx.by);
    revalidatePath(`/w/${ctx.slug}/engines`);
    return { data: { id: engine.id }, message: id === null ? `Added “${engine.name}”.` : 'Changes saved.' };
  },
  { create: true },
);

export const deleteEngineAction = workspaceRowAction('library:write', noInput, async (ctx, id) => {
  await deleteEngine({ workspaceId: ctx.workspace.id }, id, ctx.by);
  revalidatePath(`/w/${ctx.slug}/engines`);
});

/** Creates (id null) or replaces an aircraft type. */
export const saveAircraftTypeAction = workspaceRowAction(
  'library:write',
  aircraftTypeSaveSchema,
  async (ctx, id, input) => {
    const scope = { workspaceId: ctx.workspace.id };
    const type =
      id === null ? await createAircraftType(scope, input, ctx.by) : await updateAircraftType(scope, id, input, ctx.by);
    revalidatePath(`/w/${ctx.slug}/engines`);
    return { data: { id: type.id }, message: id === null ? `Added aircraft type ${type.code}.` : 'Changes saved.' };
  },
  { create: true },
);

export const deleteAircraftTypeAction = workspaceRowAction('library:write', noInput, async (ctx, id) => {
  await deleteAircraftType({ workspaceId: ctx.workspace.id }, id, ctx.by);
  revalidatePath(`/w/${ctx.slug}/engines`);
});
