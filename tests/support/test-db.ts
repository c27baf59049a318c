import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { inject, afterAll, beforeAll } from 'vitest';
import { encode } from 'next-auth/jwt';
import { resetEnvForTests } from '@/lib/env';
import { closeDb, db } from '@/db/client';
import { createUser } from '@/db/users';
import { createSession } from '@/db/sessions';
import { createWorkspace } from '@/lib/workspaces/service';
import type { Role } from '@/lib/auth/policy';

export const TEST_SECRET = 'test-secret-0123456789-abcdefghij';
export const TEST_ORIGIN = 'http://127.0.0.1:3999';

/**
 * Gives the test file its own migrated SQLite file (a copy of the template) and a test environment.
 * Call at the top level of an integration test file.
 */
export function useTestDatabase(extraEnv: Record<string, string> = {}): { file: () => string } {
  let file = '';
  let pgDatabase = '';
  beforeAll(async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-it-'));
    file = path.join(dir, 'db.sqlite');
    fs.copyFileSync(inject('templateDb'), file);
    const pgTemplate = inject('pgTemplate');
    if (pgTemplate) pgDatabase = createPostgresDatabase(pgTemplate);
    Object.assign(process.env, {
      SQLITE_FILE: file,
      DATABASE_URL: pgDatabase ? postgresUrl(pgDatabase) : '',
      NEXTAUTH_SECRET: TEST_SECRET,
      NEXTAUTH_URL: TEST_ORIGIN,
      // TEST_LOG_LEVEL=error shows the server's own error lines when a run needs them.
      LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
      ...extraEnv,
    });
    resetEnvForTests();
    await closeDb();
    await db().raw('select 1');
  });
  afterAll(async () => {
    await closeDb();
    if (pgDatabase)
      execFileSync(
        'psql',
        [postgresUrl('postgres'), '-q', '-c', `DROP DATABASE IF EXISTS ${pgDatabase} WITH (FORCE)`],
        { stdio: 'pipe' },
      );
  });
  return { file: () => file };
}

/** PostgreSQL mode: true while `npm run test:pg` runs the suite (DATABASE_URL is then postgres://). */
export const onPostgres = (): boolean => !!process.env.TEST_PG_ADMIN_URL;

function postgresUrl(database: string): string {
  const url = new URL(String(process.env.TEST_PG_ADMIN_URL));
  url.pathname = `/${database}`;
  return url.toString();
}

/** A fresh database for this test file, copied from the migrated template (CREATE DATABASE ... TEMPLATE). */
function createPostgresDatabase(template: string): string {
  const name = `tropopass_t_${process.pid}_${Math.random().toString(36).slice(2, 8)}`;
  execFileSync(
    'psql',
    [postgresUrl('postgres'), '-v', 'ON_ERROR_STOP=1', '-q', '-c', `CREATE DATABASE ${name} TEMPLATE ${template}`],
    { stdio: 'pipe' },
  );
  return name;
}

let counter = 0;

export async function makeUser(prefix = 'user'): Promise<{ id: number; email: string }> {
  counter += 1;
  const u = await createUser({
    email: `${prefix}-${counter}-${Date.now()}@example.test`,
    name: `${prefix} ${counter}`,
    passwordHash: null,
  });
  return { id: u.id, email: u.email };
}

/** A workspace with one member per given role (plus an owner), for authorisation tests. */
export async function makeWorkspace(roles: Role[] = []): Promise<{
  id: number;
  slug: string;
  owner: { id: number; email: string };
  members: Record<string, { id: number; email: string }>;
}> {
  const owner = await makeUser('owner');
  counter += 1;
  const ws = await createWorkspace({ name: `Test operator ${counter}`, ownerId: owner.id, actor: owner.email });
  const members: Record<string, { id: number; email: string }> = { owner };
  for (const role of roles) {
    if (role === 'owner') continue;
    const u = await makeUser(role);
    await db()('memberships').insert({
      workspace_id: ws.id,
      user_id: u.id,
      role,
      created_at: new Date().toISOString(),
    });
    members[role] = u;
  }
  return { id: ws.id, slug: ws.slug, owner, members };
}

/** A session cookie exactly as next-auth's JWT strategy issues it for this user. */
export async function sessionCookie(userId: number, opts: { authAt?: number; sid?: string } = {}): Promise<string> {
  const row = await db()('users').where({ id: userId }).first();
  const sid = opts.sid ?? (await createSession(userId, 12));
  const token = await encode({
    token: { uid: userId, sv: Number(row.session_version), authAt: opts.authAt ?? Date.now(), sid },
    secret: TEST_SECRET,
  });
  return `next-auth.session-token=${token}`;
}

export interface CallOptions {
  body?: unknown;
  rawBody?: string;
  cookie?: string;
  bearer?: string;
  origin?: string;
  headers?: Record<string, string>;
}

/** Builds a real Request for a route handler. */
export function apiRequest(method: string, pathname: string, opts: CallOptions = {}): Request {
  const headers = new Headers(opts.headers);
  if (opts.cookie) headers.set('cookie', opts.cookie);
  if (opts.bearer) headers.set('authorization', `Bearer ${opts.bearer}`);
  if (opts.origin) headers.set('origin', opts.origin);
  headers.set('host', new URL(TEST_ORIGIN).host);
  let body: string | undefined;
  if (opts.rawBody !== undefined) body = opts.rawBody;
  else if (opts.body !== undefined) {
    body = JSON.stringify(opts.body);
    headers.set('content-type', 'application/json');
  }
  return new Request(new URL(pathname, TEST_ORIGIN), { method, headers, body });
}

export type RouteHandler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

export interface ErrorJson {
  error?: { code: string; message: string; fields?: { path: string; message: string }[] };
}

/** Calls a route handler; `T` is the shape the test expects of the JSON body. */
export async function call<T = Record<string, unknown>>(
  handler: unknown,
  req: Request,
  params: Record<string, string> = {},
): Promise<{ status: number; body: T & ErrorJson; headers: Headers }> {
  const res = await (handler as RouteHandler)(req, { params: Promise.resolve(params) });
  const text = await res.text();
  let body: unknown = text;
  try {
    body = text ? JSON.parse(text) : null;
  } catch {
    /* not JSON: keep the text */
  }
  return { status: res.status, body: body as T & ErrorJson, headers: res.headers };
}
