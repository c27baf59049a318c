import { apiRequest, call, sessionCookie } from '../../support/test-db';
import * as periodRoute from '@/app/api/v1/workspaces/[slug]/periods/[id]/route';
import * as reviewRoute from '@/app/api/v1/workspaces/[slug]/periods/[id]/review/route';
import * as signRoute from '@/app/api/v1/workspaces/[slug]/periods/[id]/sign/route';
import * as reopenRoute from '@/app/api/v1/workspaces/[slug]/periods/[id]/reopen/route';
import * as targetsRoute from '@/app/api/v1/workspaces/[slug]/periods/[id]/targets/route';
import * as auditPackRoute from '@/app/api/v1/workspaces/[slug]/periods/[id]/audit-pack/route';
import * as reportRoute from '@/app/api/v1/workspaces/[slug]/periods/[id]/report/route';
import type { PeriodView } from '@/lib/periods/service';

export const ROUTES = { periodRoute, reviewRoute, signRoute, reopenRoute, targetsRoute, auditPackRoute, reportRoute };

const path = (slug: string, ref: string, rest = '') => `/api/v1/workspaces/${slug}/periods/${ref}${rest}`;

export async function getView(slug: string, ref: string, userId: number) {
  return call<PeriodView>(
    periodRoute.GET,
    apiRequest('GET', path(slug, ref), { cookie: await sessionCookie(userId) }),
    { slug, id: ref },
  );
}

export async function post(handler: unknown, slug: string, ref: string, rest: string, userId: number, body?: unknown) {
  return call<Record<string, unknown>>(
    handler,
    apiRequest('POST', path(slug, ref, rest), { cookie: await sessionCookie(userId), body }),
    { slug, id: ref },
  );
}

export async function putTargets(slug: string, ref: string, userId: number, targets: unknown[]) {
  return call<Record<string, unknown>>(
    targetsRoute.PUT,
    apiRequest('PUT', path(slug, ref, '/targets'), { cookie: await sessionCookie(userId), body: { targets } }),
    { slug, id: ref },
  );
}

/** The raw response of a download route (zip or PDF). */
export async function download(handler: unknown, slug: string, ref: string, rest: string, userId: number) {
  return (handler as (r: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>)(
    apiRequest('GET', path(slug, ref, rest), { cookie: await sessionCookie(userId) }),
    { params: Promise.resolve({ slug, id: ref }) },
  );
}
