'use server';

import { revalidatePath } from 'next/cache';
import { requireActionMember } from '@/lib/auth/guards';
import { createRoute, deleteRoute, updateRoute } from '@/db/routes';
import { routeFormSchema, waypointProblemMessage } from '@/lib/validation/library';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';
import { actionId, optionalActionId } from '@/lib/validation/action-input';

/** Server problems at `waypoints.N...` belong beside the waypoint box of the form. */
function onFormFields(state: ActionState<never>): ActionState<never> {
  if (!state || state.ok || !state.error.fields) return state;
  const fields = state.error.fields.map((f) => (f.path.startsWith('waypoints') ? { path: 'waypointsText', message: waypointProblemMessage(f.path, f.message) } : f));
  return { ok: false, error: { ...state.error, fields } };
}

/** Creates (id null) or replaces a saved route from the route form's values. */
export async function saveRouteAction(slug: string, id: number | null, raw: unknown): Promise<ActionState<{ id: number }>> {
  try {
    const ctx = await requireActionMember(slug, 'library:write');
    const parsed = routeFormSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    const by = { userId: ctx.user.id, actor: ctx.user.email };
    const scope = { workspaceId: ctx.workspace.id };
    const target = optionalActionId(id);
    const route = target === null ? await createRoute(scope, parsed.data, by) : await updateRoute(scope, target, parsed.data, by);
    revalidatePath(`/w/${slug}/routes`);
    return { ok: true, data: { id: route.id }, message: target === null ? `Saved “${route.name}”.` : 'Changes saved.' };
  } catch (err) {
    return onFormFields(toActionState(err));
  }
}

export async function deleteRouteAction(slug: string, id: number): Promise<ActionState> {
  try {
    const ctx = await requireActionMember(slug, 'library:write');
    await deleteRoute({ workspaceId: ctx.workspace.id }, actionId(id), { userId: ctx.user.id, actor: ctx.user.email });
    revalidatePath(`/w/${slug}/routes`);
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}
