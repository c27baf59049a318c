import 'server-only';
import { db } from './client';

/** The tables behind workspace detail pages, by the path segment(s) before the id. */
const DETAIL_TABLES: Record<string, string> = {
  engines: 'engines',
  'engines/aircraft': 'aircraft_types',
  routes: 'routes',
  soundings: 'soundings',
  reports: 'reports',
};

/**
 * For a workspace detail path (`/w/{slug}/engines/12`), whether the item exists in that workspace;
 * null when the path is not a detail page known here (the page then decides alone).
 */
export async function detailItemExists(scope: { workspaceId: number }, pathname: string): Promise<boolean | null> {
  const m = /^\/w\/[^/]+\/(engines\/aircraft|engines|routes|soundings|reports)\/([^/]+)\/?$/.exec(pathname);
  if (!m) return null;
  const table = DETAIL_TABLES[m[1]];
  if (!/^\d{1,10}$/.test(m[2])) return false;
  const id = Number(m[2]);
  if (id < 1 || id > 2_147_483_647) return false;
  return !!(await db()(table).where({ workspace_id: scope.workspaceId, id }).first('id'));
}
