import 'server-only';
import type { z } from 'zod';
import { userFromRequest, type SessionUser } from '@/lib/auth/session';
import { type ApiKeyPrincipal } from '@/db/api-keys';
import { findApiKey } from '@/lib/auth/api-keys';
import { getMembership, type WorkspaceDto } from '@/db/workspaces';
import { can, type Permission, type Role } from '@/lib/auth/policy';
import { isAllowedOrigin } from '@/lib/auth/origin';
import { limitApi } from '@/lib/auth/throttle';
import {
  badRequest,
  forbidden,
  fromZod,
  invalidFields,
  notFound,
  toResponse,
  tooLarge,
  unauthenticated,
} from '@/lib/errors';
import { env } from '@/lib/env';
import { log } from '@/lib/log';

export type Principal = { kind: 'user'; user: SessionUser } | { kind: 'key'; key: ApiKeyPrincipal };

export interface RouteContext<P> {
  req: Request;
  params: P;
  principal: Principal;
  /** Present when the route is under `/workspaces/{slug}`. */
  member?: { workspace: WorkspaceDto; role: Role };
  /** The acting user's id, or null for an API key. */
  userId: number | null;
  actorLabel: string;
}

export interface WorkspaceRouteContext<P> extends RouteContext<P> {
  member: { workspace: WorkspaceDto; role: Role };
}

const MUTATING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

async function authenticate(req: Request): Promise<Principal> {
  const auth = req.headers.get('authorization');
  if (auth) {
    const m = /^Bearer\s+(\S+)$/i.exec(auth);
    if (!m) throw unauthenticated('The Authorization header must be "Bearer <key>".');
    const key = await findApiKey(m[1]);
    if (!key) {
      log.warn(
        { event: 'auth.rejected', reason: 'api_key', path: new URL(req.url).pathname },
        'unknown or revoked API key',
      );
      throw unauthenticated('That API key is unknown or revoked.');
    }
    return { kind: 'key', key };
  }
  const user = await userFromRequest(req);
  if (!user) throw unauthenticated();
  if (MUTATING.has(req.method) && !isAllowedOrigin(req.headers.get('origin'), req.headers.get('host'))) {
    log.warn(
      { event: 'csrf.refused', origin: req.headers.get('origin'), userId: user.id, path: new URL(req.url).pathname },
      'cross-site request refused',
    );
    throw forbidden('This request came from another site and was refused.');
  }
  return { kind: 'user', user };
}

function principalLabel(p: Principal): string {
  return p.kind === 'user' ? p.user.email : `api-key:${p.key.keyName}`;
}

async function resolveMember(p: Principal, slug: string): Promise<{ workspace: WorkspaceDto; role: Role }> {
  if (p.kind === 'key') {
    if (p.key.workspace.slug !== slug) {
      log.warn(
        { event: 'authz.not_member', apiKeyId: p.key.keyId, workspace: slug },
        'API key used outside its workspace',
      );
      throw notFound();
    }
    return { workspace: { ...p.key.workspace, createdAt: '' }, role: p.key.role };
  }
  const m = await getMembership({ userId: p.user.id, slug });
  if (!m) {
    log.warn({ event: 'authz.not_member', userId: p.user.id, workspace: slug }, 'not a member of this workspace');
    throw notFound();
  }
  return m;
}

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

/** A route that needs a signed-in caller or a key, but no workspace (computation-only routes). */
export function authedRoute<P = Record<string, never>>(fn: (ctx: RouteContext<P>) => Promise<Response>): Handler<P> {
  return async (req, ctx) => {
    try {
      const principal = await authenticate(req);
      await limitApi(principal.kind === 'user' ? `u:${principal.user.id}` : `k:${principal.key.keyId}`);
      const params = (await ctx?.params) ?? ({} as P);
      return withNoStore(
        await fn({
          req,
          params,
          principal,
          userId: principal.kind === 'user' ? principal.user.id : null,
          actorLabel: principalLabel(principal),
        }),
      );
    } catch (err) {
      return failure(req, err);
    }
  };
}

/** A route under `/workspaces/{slug}`: authenticate -> member of this workspace (else 404) -> permission (else 403). */
export function workspaceRoute<P extends { slug: string }>(
  permission: Permission,
  fn: (ctx: WorkspaceRouteContext<P>) => Promise<Response>,
): Handler<P> & { permission: Permission } {
  const handler = async (req: Request, ctx: { params: Promise<P> }) => {
    try {
      const principal = await authenticate(req);
      await limitApi(principal.kind === 'user' ? `u:${principal.user.id}` : `k:${principal.key.keyId}`);
      const params = await ctx.params;
      const member = await resolveMember(principal, params.slug);
      if (!can(member.role, permission)) {
        log.warn({ event: 'authz.denied', permission, role: member.role, workspace: params.slug }, 'permission denied');
        throw forbidden();
      }
      return withNoStore(
        await fn({
          req,
          params,
          principal,
          member,
          userId: principal.kind === 'user' ? principal.user.id : null,
          actorLabel: principalLabel(principal),
        }),
      );
    } catch (err) {
      return failure(req, err);
    }
  };
  return Object.assign(handler, { permission });
}

function withNoStore(res: Response): Response {
  if (!res.headers.has('cache-control')) res.headers.set('cache-control', 'no-store');
  return res;
}

/**
 * PostgreSQL refuses a number outside its column's range (22003) or text where a number belongs
 * (22P02); SQLite stores either. Such a value can only have come from the request, so it is bad
 * input, not a server fault.
 */
function fromDatabaseInputError(req: Request, err: unknown): unknown {
  const code = err instanceof Error ? (err as Error & { code?: unknown }).code : undefined;
  if (code !== '22003' && code !== '22P02') return err;
  const where = req.method === 'GET' || req.method === 'DELETE' ? '(query)' : '(body)';
  return invalidFields([
    {
      path: where,
      message: 'A number in this request is out of range (ids, cursors and counts are whole numbers up to 2147483647).',
    },
  ]);
}

function failure(req: Request, err: unknown): Response {
  const res = toResponse(fromDatabaseInputError(req, err));
  const path = new URL(req.url).pathname;
  if (res.status === 422 || res.status === 400 || res.status === 413)
    log.info({ event: 'input.rejected', path, status: res.status }, 'input rejected');
  else if (res.status === 429) log.warn({ event: 'throttled', path }, 'request throttled');
  return res;
}

/** Reads the raw body with a size limit (413) before any parsing. */
export async function readBodyText(req: Request, limit = env().BODY_LIMIT_BYTES): Promise<string> {
  const declared = Number(req.headers.get('content-length') ?? '0');
  if (declared > limit) throw tooLarge(`The request body is larger than ${Math.round(limit / 1000)} kB.`);
  if (!req.body) return '';
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel();
      throw tooLarge(`The request body is larger than ${Math.round(limit / 1000)} kB.`);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks).toString('utf8');
}

/** JSON body -> schema; 400 when unreadable, 413 when too large, 422 with field paths when invalid. */
export async function readJson<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  const text = await readBodyText(req);
  let raw: unknown;
  try {
    raw = text.trim() === '' ? undefined : JSON.parse(text);
  } catch {
    throw badRequest('The request body is not valid JSON.');
  }
  if (raw === undefined) throw badRequest('The request body is empty; send a JSON object.');
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw fromZod(parsed.error);
  return parsed.data;
}

/** The query string -> schema (each name once, as text); 422 with field paths when invalid. */
export function readQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  const parsed = schema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!parsed.success) throw fromZod(parsed.error);
  return parsed.data;
}

export function json(data: unknown, status = 200, headers?: Record<string, string>): Response {
  return Response.json(data, { status, headers });
}

/** The largest id a row can have (PostgreSQL `integer`, the type of every id column). */
export const MAX_ID = 2_147_483_647;

/** Parses an integer path parameter; anything else (or anything larger than an id can be) is simply not found. */
export function idParam(value: string): number {
  if (!/^\d{1,10}$/.test(value)) throw notFound();
  const id = Number(value);
  if (id > MAX_ID) throw notFound();
  return id;
}
