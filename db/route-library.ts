import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { auditChange } from './audit';
import type { LibraryActor } from './engines';
import { notFound } from '@/lib/errors';

/** A fix to save, as `fixRowSchema` gives it. */
export interface FixRow {
  name: string;
  lat: number;
  lon: number;
  region?: string;
}

/** An airway to save, as `airwayRowSchema` gives it: its designator and its fix names in order. */
export interface AirwayRow {
  name: string;
  fixes: string[];
}

/** A workspace's fixes and airways in the shape the flight-plan reader takes (`RouteLibrary` of the engine). */
export interface RouteLibraryData {
  fixes: { name: string; lat: number; lon: number; region: string | null }[];
  airways: { name: string; fixes: string[] }[];
}

/** A named point of the workspace's fix library (degrees, WGS-84). `region` is '' when none. */
export interface FixDto {
  id: number;
  name: string;
  region: string;
  lat: number;
  lon: number;
  createdAt: string;
}

/** An airway of the workspace's library: its fix names in sequence order. */
export interface AirwayDto {
  id: number;
  name: string;
  fixes: string[];
  createdAt: string;
}

type Row = Record<string, unknown>;
type Db = Knex | Knex.Transaction;

const fixOf = (r: Row): FixDto => ({
  id: Number(r.id),
  name: String(r.name),
  region: String(r.region ?? ''),
  lat: Number(r.lat),
  lon: Number(r.lon),
  createdAt: String(r.created_at),
});

function likePrefix(q: string): string {
  return `${q.toUpperCase().replace(/[%_\\]/g, '')}%`;
}

/** Fixes of a workspace by name (then region), optionally those whose name starts with `q`; at most `limit`. */
export async function listFixes(
  scope: { workspaceId: number },
  opts: { q?: string; limit?: number } = {},
  trx: Db = db(),
): Promise<FixDto[]> {
  const query = trx('fixes').where({ workspace_id: scope.workspaceId }).orderBy('name').orderBy('region').orderBy('id');
  if (opts.q) query.andWhere('name', 'like', likePrefix(opts.q));
  if (opts.limit !== undefined) query.limit(opts.limit);
  return (await query).map(fixOf);
}

/** Airways of a workspace by name, each with its fix names in order; optionally those starting with `q`. */
export async function listAirways(
  scope: { workspaceId: number },
  opts: { q?: string; limit?: number } = {},
  trx: Db = db(),
): Promise<AirwayDto[]> {
  const query = trx('airways').where({ workspace_id: scope.workspaceId }).orderBy('name').orderBy('id');
  if (opts.q) query.andWhere('name', 'like', likePrefix(opts.q));
  if (opts.limit !== undefined) query.limit(opts.limit);
  const rows = (await query) as Row[];
  if (rows.length === 0) return [];
  const ids = rows.map((r) => Number(r.id));
  const points = (await trx('airway_fixes')
    .whereIn('airway_id', ids)
    .orderBy('airway_id')
    .orderBy('sequence')) as Row[];
  const byAirway = new Map<number, string[]>();
  for (const p of points) {
    const id = Number(p.airway_id);
    const list = byAirway.get(id);
    if (list) list.push(String(p.fix_name));
    else byAirway.set(id, [String(p.fix_name)]);
  }
  return rows.map((r) => ({
    id: Number(r.id),
    name: String(r.name),
    fixes: byAirway.get(Number(r.id)) ?? [],
    createdAt: String(r.created_at),
  }));
}

/** Everything a flight-plan route of this workspace may name: its fixes and airways. */
export async function loadRouteLibrary(scope: { workspaceId: number }, trx: Db = db()): Promise<RouteLibraryData> {
  const [fixes, airways] = await Promise.all([listFixes(scope, {}, trx), listAirways(scope, {}, trx)]);
  return {
    fixes: fixes.map((f) => ({ name: f.name, lat: f.lat, lon: f.lon, region: f.region || null })),
    airways: airways.map((a) => ({ name: a.name, fixes: a.fixes })),
  };
}

/**
 * Adds fixes in one transaction; a fix with the same name and region already in the library is
 * moved to the new position. Returns how many were added and how many updated.
 */
export async function saveFixes(
  scope: { workspaceId: number },
  fixes: readonly FixRow[],
  by: LibraryActor & { fileName?: string },
): Promise<{ added: number; updated: number }> {
  return writeTx(async (trx) => {
    let added = 0;
    let updated = 0;
    const now = nowIso();
    for (const f of fixes) {
      const region = f.region ?? '';
      const n = await trx('fixes')
        .where({ workspace_id: scope.workspaceId, name: f.name, region })
        .update({ lat: f.lat, lon: f.lon });
      if (n > 0) updated++;
      else {
        await trx('fixes').insert({
          workspace_id: scope.workspaceId,
          name: f.name,
          region,
          lat: f.lat,
          lon: f.lon,
          created_by: by.userId,
          created_at: now,
        });
        added++;
      }
    }
    await auditChange(trx, scope, by, {
      action: 'fix.import',
      target: by.fileName ?? null,
      detail: { added, updated },
    });
    return { added, updated };
  });
}

/**
 * Stores airways in one transaction; an airway of the same name already in the library is replaced
 * by the new sequence. Returns how many were added and how many replaced.
 */
export async function saveAirways(
  scope: { workspaceId: number },
  airways: readonly AirwayRow[],
  by: LibraryActor & { fileName?: string },
): Promise<{ added: number; updated: number }> {
  return writeTx(async (trx) => {
    let added = 0;
    let updated = 0;
    const now = nowIso();
    for (const a of airways) {
      const existing = (await trx('airways').where({ workspace_id: scope.workspaceId, name: a.name }).first()) as
        Row | undefined;
      let id: number;
      if (existing) {
        id = Number(existing.id);
        await trx('airway_fixes').where({ airway_id: id }).delete();
        updated++;
      } else {
        id = await insertId(
          trx('airways').insert(
            { workspace_id: scope.workspaceId, name: a.name, created_by: by.userId, created_at: now },
            ['id'],
          ),
        );
        added++;
      }
      await trx('airway_fixes').insert(a.fixes.map((fix, i) => ({ airway_id: id, sequence: i + 1, fix_name: fix })));
    }
    await auditChange(trx, scope, by, {
      action: 'airway.import',
      target: by.fileName ?? null,
      detail: { added, updated },
    });
    return { added, updated };
  });
}

export async function deleteFix(scope: { workspaceId: number }, id: number, by: LibraryActor): Promise<void> {
  await writeTx(async (trx) => {
    const row = (await trx('fixes').where({ workspace_id: scope.workspaceId, id }).first()) as Row | undefined;
    if (!row) throw notFound('No fix with that id in this workspace.');
    await trx('fixes').where({ workspace_id: scope.workspaceId, id }).delete();
    await auditChange(trx, scope, by, {
      action: 'fix.delete',
      target: `fix:${id}`,
      detail: { name: String(row.name) },
    });
  });
}

export async function deleteAirway(scope: { workspaceId: number }, id: number, by: LibraryActor): Promise<void> {
  await writeTx(async (trx) => {
    const row = (await trx('airways').where({ workspace_id: scope.workspaceId, id }).first()) as Row | undefined;
    if (!row) throw notFound('No airway with that id in this workspace.');
    await trx('airway_fixes').where({ airway_id: id }).delete();
    await trx('airways').where({ workspace_id: scope.workspaceId, id }).delete();
    await auditChange(trx, scope, by, {
      action: 'airway.delete',
      target: `airway:${id}`,
      detail: { name: String(row.name) },
    });
  });
}
