import path from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { setActionRequest } from '../../support/next-request';
import { makeUser, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import { serverActions } from './discover';
import { PERMISSIONS, ROLES, can, type Permission, type Role } from '@/lib/auth/policy';
import type { ActionState } from '@/lib/errors';

// Outside a Next.js request there are no request headers: the stub serves the ones each call sets.
vi.mock('next/headers', () => import('../../support/next-request'));

useTestDatabase({ RATE_LIMIT_EMAIL_PER_HOUR: '1000000' });

/**
 * Server actions anyone may call (no account yet), each with its reason. They are written by hand;
 * each must still refuse a foreign Origin, which the source check below looks for.
 */
const PUBLIC_ACTIONS: Record<string, string> = {
  'app/(auth)/actions.ts#signInWithPasswordAction':
    'checks the e-mail and password itself, throttled like the credentials provider',
  'app/(auth)/actions.ts#signUpAction': 'creates the account',
  'app/(auth)/actions.ts#requestPasswordResetAction': 'answers the same whether or not the address exists',
  'app/(auth)/actions.ts#resetPasswordAction': 'authenticated by the single-use reset token',
};

/** Form adapters (`(prev, FormData)`) that only read the posted fields and call a wrapped action of the same file. */
const FORM_ADAPTERS: Record<string, string> = {
  'app/(app)/w/[slug]/settings/api-keys/actions.ts#createApiKeyFormAction': 'createApiKeyAction',
};

type AnyAction = (...args: unknown[]) => Promise<ActionState<unknown>>;
interface Loaded {
  id: string;
  fn: AnyAction & { permission?: Permission; takesId?: boolean; access?: 'user' };
}

const ROOT = process.cwd();
const discovered = serverActions();
const loaded: Loaded[] = [];

beforeAll(async () => {
  for (const file of discovered.files) {
    const mod = (await import(/* @vite-ignore */ path.join(ROOT, file))) as Record<string, unknown>;
    for (const [name, value] of Object.entries(mod)) {
      if (typeof value === 'function') loaded.push({ id: `${file}#${name}`, fn: value as Loaded['fn'] });
    }
  }
});

const workspaceActions = () => loaded.filter((a) => a.fn.permission !== undefined);
const userActions = () => loaded.filter((a) => a.fn.access === 'user');
const codeOf = (s: ActionState<unknown>) => (s && !s.ok ? s.error.code : 'ok');

/** Calls an action as the wrapper's two shapes want: `(slug, input)` or `(slug, id, input)`. */
function callAction(a: Loaded, slug: string): Promise<ActionState<unknown>> {
  // An empty object is invalid input for every action, so an allowed call stops at validation and changes nothing.
  return a.fn.takesId ? a.fn(slug, 999_999_999, {}) : a.fn(slug, {});
}

describe('every server action is accounted for', () => {
  it('finds the action files and their exports', () => {
    expect(discovered.files.length).toBeGreaterThanOrEqual(8);
    expect(workspaceActions().length).toBeGreaterThanOrEqual(25);
    expect(userActions().length).toBeGreaterThanOrEqual(3);
  });

  it('each action is built by workspaceAction / workspaceRowAction (a known permission) or userAction, or is public with a reason', () => {
    const problems: string[] = [];
    for (const a of loaded) {
      if (a.fn.permission !== undefined) {
        if (!(PERMISSIONS as readonly string[]).includes(a.fn.permission))
          problems.push(`${a.id}: unknown permission ${a.fn.permission}`);
        continue;
      }
      if (a.fn.access === 'user' || PUBLIC_ACTIONS[a.id]) continue;
      const wrapped = FORM_ADAPTERS[a.id];
      if (
        wrapped !== undefined &&
        loaded.some((b) => b.id === `${a.id.split('#')[0]}#${wrapped}` && b.fn.permission !== undefined)
      )
        continue;
      // The sign-in area's hand-written actions: their source must call the user guard.
      const source = discovered.actions.find((x) => `${x.file}#${x.name}` === a.id);
      if (a.id.startsWith('app/(auth)/') && source?.guards.includes('requireActionUser')) continue;
      problems.push(`${a.id}: wrap it in workspaceAction(permission, schema, fn), workspaceRowAction or userAction`);
    }
    expect(problems).toEqual([]);
    const reexports = discovered.actions.filter((a) => a.name.startsWith('(re-export'));
    expect(
      reexports.map((a) => `${a.file} ${a.name}`),
      "a 'use server' file must define its actions",
    ).toEqual([]);
  });

  it('public actions call assertSameOrigin, and every name on the list still exists', () => {
    for (const id of Object.keys(PUBLIC_ACTIONS)) {
      const a = discovered.actions.find((x) => `${x.file}#${x.name}` === id);
      expect(a, `${id} no longer exists`).toBeDefined();
      expect(a?.guards, id).toContain('assertSameOrigin');
    }
  });
});

describe('every role x every workspace action x own and other workspace', () => {
  let own: Awaited<ReturnType<typeof makeWorkspace>>;
  let other: Awaited<ReturnType<typeof makeWorkspace>>;
  beforeAll(async () => {
    own = await makeWorkspace(['planner', 'analyst', 'viewer', 'billing']);
    other = await makeWorkspace(['planner']);
  });

  it('members: 404 in another workspace, 403 where the policy denies, input checked (422) where it allows', async () => {
    const failures: string[] = [];
    let calls = 0;
    for (const role of ROLES) {
      const member = (own.members as Record<Role, { id: number }>)[role];
      setActionRequest({ cookie: await sessionCookie(member.id) });
      for (const a of workspaceActions()) {
        const permission = a.fn.permission as Permission;
        const mine = codeOf(await callAction(a, own.slug));
        const expected = can(role, permission) ? 'invalid_fields' : 'forbidden';
        if (mine !== expected) failures.push(`${a.id} as ${role} (${permission}): ${mine}, expected ${expected}`);
        const theirs = codeOf(await callAction(a, other.slug));
        if (theirs !== 'not_found')
          failures.push(`${a.id} as ${role} in another workspace: ${theirs}, expected not_found`);
        calls += 2;
      }
    }
    console.info(`[authz] ${calls} action calls over ${workspaceActions().length} workspace actions`);
    expect(failures).toEqual([]);
  });

  it('a signed-in stranger gets 404, a signed-out caller 401, and a foreign Origin 403, on every action', async () => {
    const stranger = await makeUser('stranger');
    const failures: string[] = [];
    const strangerCookie = await sessionCookie(stranger.id);
    const ownerCookie = await sessionCookie(own.owner.id);
    for (const a of workspaceActions()) {
      setActionRequest({ cookie: strangerCookie });
      const s = codeOf(await callAction(a, own.slug));
      if (s !== 'not_found') failures.push(`${a.id} stranger: ${s}`);
      setActionRequest({});
      const anon = codeOf(await callAction(a, own.slug));
      if (anon !== 'unauthenticated') failures.push(`${a.id} signed out: ${anon}`);
      setActionRequest({ cookie: ownerCookie, origin: 'https://elsewhere.example' });
      const csrf = codeOf(await callAction(a, own.slug));
      if (csrf !== 'forbidden') failures.push(`${a.id} foreign origin: ${csrf}`);
    }
    for (const a of userActions()) {
      setActionRequest({});
      const anon = codeOf(await a.fn({}));
      if (anon !== 'unauthenticated') failures.push(`${a.id} signed out: ${anon}`);
      setActionRequest({ cookie: ownerCookie, origin: 'https://elsewhere.example' });
      const csrf = codeOf(await a.fn({}));
      if (csrf !== 'forbidden') failures.push(`${a.id} foreign origin: ${csrf}`);
    }
    expect(failures).toEqual([]);
  });
});
