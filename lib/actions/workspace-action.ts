import 'server-only';
import { z } from 'zod';
import { requireActionMember, requireActionUser, type MemberContext } from '@/lib/auth/guards';
import type { Permission } from '@/lib/auth/policy';
import type { SessionUser } from '@/lib/auth/session';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';
import { actionId } from '@/lib/validation/action-input';

/**
 * The spine of every server action, written once like `workspaceRoute` for handlers: same-origin
 * check -> session -> membership (404 when not a member, logged) -> permission (403, logged) ->
 * `schema.safeParse` (422 with fields by dotted path) -> the domain call -> an `ActionState`. Any
 * thrown error becomes the same `{ ok: false, error }` state; nothing leaks. The returned action
 * carries its `permission`, so the authorisation matrix finds and calls every one for every role.
 */

/** What a successful action hands back to its form. */
export type ActionDone<T> = { data?: T; message?: string } | void;

export interface WorkspaceActionContext extends MemberContext {
  slug: string;
  /** The acting user, as the audit trail records it. */
  by: { userId: number; actor: string };
}

interface ActionOptions {
  /** Rewrites an error state before it goes back (field paths the form knows, a revalidation). */
  onError?: (state: ActionState<never>, slug: string) => ActionState<never>;
}

export type WorkspaceAction<T> = ((slug: string, raw?: unknown) => Promise<ActionState<T>>) & {
  permission: Permission;
  takesId: false;
};
export type WorkspaceRowAction<T> = ((slug: string, id: unknown, raw?: unknown) => Promise<ActionState<T>>) & {
  permission: Permission;
  takesId: true;
};
export type UserAction<T> = ((raw?: unknown) => Promise<ActionState<T>>) & { access: 'user' };

/** For actions that take no input besides the workspace (and the row): accepts nothing else. */
export const noInput = z.undefined({ error: 'This action takes no input.' });

const done = <T>(r: ActionDone<T>): ActionState<T> => ({ ok: true, ...(r ?? {}) });

async function member(slug: string, permission: Permission): Promise<WorkspaceActionContext> {
  const ctx = await requireActionMember(slug, permission);
  return { ...ctx, slug, by: { userId: ctx.user.id, actor: ctx.user.email } };
}

function parse<S extends z.ZodType>(schema: S, raw: unknown): z.output<S> {
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw fromZod(parsed.error);
  return parsed.data;
}

/** `(slug, input)`: an action on the workspace as a whole. */
export function workspaceAction<S extends z.ZodType, T = undefined>(
  permission: Permission,
  schema: S,
  fn: (ctx: WorkspaceActionContext, input: z.output<S>) => Promise<ActionDone<T>>,
  opts: ActionOptions = {},
): WorkspaceAction<T> {
  const action = async (slug: string, raw?: unknown): Promise<ActionState<T>> => {
    try {
      const ctx = await member(slug, permission);
      return done(await fn(ctx, parse(schema, raw)));
    } catch (err) {
      const state = toActionState(err);
      return opts.onError ? opts.onError(state, slug) : state;
    }
  };
  return Object.assign(action, { permission, takesId: false as const });
}

/**
 * `(slug, id, input)`: an action on one row, the id bound by the page (`action.bind(null, slug, id)`).
 * With `create: true` an id of null means "make a new one".
 */
export function workspaceRowAction<S extends z.ZodType, T = undefined, C extends boolean = false>(
  permission: Permission,
  schema: S,
  fn: (
    ctx: WorkspaceActionContext,
    id: C extends true ? number | null : number,
    input: z.output<S>,
  ) => Promise<ActionDone<T>>,
  opts: ActionOptions & { create?: C } = {},
): WorkspaceRowAction<T> {
  const action = async (slug: string, rawId: unknown, raw?: unknown): Promise<ActionState<T>> => {
    try {
      const ctx = await member(slug, permission);
      let id: number | null = null;
      // An id that is an array, an object or not a whole number is a 400 (actionId), never coerced.
      if (!(opts.create && rawId === null)) id = actionId(rawId);
      const input = parse(schema, raw);
      return done(await fn(ctx, id as C extends true ? number | null : number, input));
    } catch (err) {
      const state = toActionState(err);
      return opts.onError ? opts.onError(state, slug) : state;
    }
  };
  return Object.assign(action, { permission, takesId: true as const });
}

/** `(input)`: an action on the signed-in user's own account, outside any workspace. */
export function userAction<S extends z.ZodType, T = undefined>(
  schema: S,
  fn: (user: SessionUser, input: z.output<S>) => Promise<ActionDone<T>>,
): UserAction<T> {
  const action = async (raw?: unknown): Promise<ActionState<T>> => {
    try {
      const user = await requireActionUser();
      return done(await fn(user, parse(schema, raw)));
    } catch (err) {
      return toActionState(err);
    }
  };
  return Object.assign(action, { access: 'user' as const });
}
