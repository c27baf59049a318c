'use server';

import { revalidatePath } from 'next/cache';
import { deleteRoute } from '@/db/routes';
import { createRoute, updateRoute } from '@/lib/library/routes';
import { routeFormSchema, waypointProblemMessage } from '@/lib/validation/library';
import type { ActionState } from '@/lib/errors';
import { noInput, workspaceRowAction } from '@/lib/actions/workspace-action';

/** Server problems at `waypoints.N...` belong beside the waypoint box of the form. */
function onFormFields(state: ActionState<never>): ActionState<never> {
  if (!state || state.ok || !state.error.fields) return state;
  const fields = state.error.fields.map((f) =>
    f.path.startsWith('waypoints') ? { path: 'waypointsText', message: waypointProblemMessage(f.path, f.message) } : f,
  );
  return { ok: false, error: { ...state.error, fields } };
}

/** Creates (id null) or replaces a saved route from the route form's values. */
export const saveRouteAction = workspaceRowAction(
  'library:write',
  routeFormSchema,
  async (ctx, id, input) => {
    const scope = { workspaceId: ctx.workspace.id };
    const route = id === null ? await createRoute(scope, input, ctx.by) : await updateRoute(scope, id, input, ctx.by);
    revalidatePath(`/w/${ctx.slug}/routes`);
    return { data: { id: route.id }, message: id === null ? `Saved “${route.name}”.` : 'Changes saved.' };
  },
  { create: true, onError: onFormFields },
);

export const deleteRouteAction = workspaceRowAction('library:write', noInput, async (ctx, id) => {
  await deleteRoute({ workspaceId: ctx.workspace.id }, id, ctx.by);
  revalidatePath(`/w/${ctx.slug}/routes`);
});
