import 'server-only';
import type { Knex } from 'knex';
import { insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
import { badRequest } from '@/lib/errors';

export interface LibraryCopyInclude {
  engines: boolean;
  aircraftTypes: boolean;
  fleets: boolean;
}

export interface LibraryCopyResult {
  engines: { copied: string[]; skipped: string[] };
  aircraftTypes: { copied: string[]; skipped: string[] };
  fleets: { copied: string[]; skipped: string[] };
}

type Row = Record<string, unknown>;

const ENGINE_FIELDS = [
  'ff_idle_kg_s',
  'ff_approach_kg_s',
  'ff_climb_out_kg_s',
  'ff_take_off_kg_s',
  'ei_idle_g_kg',
  'ei_approach_g_kg',
  'ei_climb_out_g_kg',
  'ei_take_off_g_kg',
  'source',
  'is_demo',
] as const;
const TYPE_FIELDS = ['name', 'engine_count', 'typical_mach', 'typical_flight_level', 'direct_ei_g_kg'] as const;

/**
 * Copies `rows` (engines or fleets) into the target workspace `to` unless it has one of the same
 * name, which is kept and reported as skipped. Returns the target id of every source id handled.
 */
async function copyByName(
  trx: Knex.Transaction,
  table: 'engines' | 'fleets',
  to: { workspace_id: number },
  rows: Row[],
  valuesOf: (row: Row) => Row,
  report: { copied: string[]; skipped: string[] },
): Promise<Map<number, number>> {
  const byName = new Map(
    ((await trx(table).where(to).select('id', 'name')) as Row[]).map((r) => [String(r.name), Number(r.id)]),
  );
  const idMap = new Map<number, number>();
  for (const r of rows) {
    const name = String(r.name);
    const existing = byName.get(name);
    if (existing !== undefined) {
      idMap.set(Number(r.id), existing);
      report.skipped.push(name);
      continue;
    }
    const id = await insertId(
      trx(table)
        .insert({ ...to, name, ...valuesOf(r) })
        .returning('id'),
    );
    idMap.set(Number(r.id), id);
    byName.set(name, id);
    report.copied.push(name);
  }
  return idMap;
}

/**
 * Copies engines, aircraft types and fleet definitions (name and description, no flights) from one
 * workspace to another in one transaction. What the target already has by the same name (engines,
 * fleets) or code (aircraft types) is kept as it is and reported as skipped; a copied type points at
 * the target's engine and default fleet of the same names. The caller checks it may do this in both.
 */
export async function copyLibrary(
  input: { fromWorkspaceId: number; toWorkspaceId: number; include: LibraryCopyInclude },
  actor: { userId: number | null; label: string },
): Promise<LibraryCopyResult> {
  if (input.fromWorkspaceId === input.toWorkspaceId)
    throw badRequest('Choose two different workspaces to copy between.');
  const result: LibraryCopyResult = {
    engines: { copied: [], skipped: [] },
    aircraftTypes: { copied: [], skipped: [] },
    fleets: { copied: [], skipped: [] },
  };
  const from = { workspace_id: input.fromWorkspaceId };
  const to = { workspace_id: input.toWorkspaceId };
  return writeTx(async (trx) => {
    const now = nowIso();
    const [srcEngines, srcFleets, srcTypes] = (await Promise.all([
      trx('engines').where(from).orderBy('name'),
      trx('fleets').where(from).orderBy('name'),
      trx('aircraft_types').where(from).orderBy('code'),
    ])) as [Row[], Row[], Row[]];
    // A copied type needs its engine and default fleet in the target, so those come along with it.
    const neededEngines = new Set<number>(
      input.include.aircraftTypes ? srcTypes.filter((t) => t.engine_id !== null).map((t) => Number(t.engine_id)) : [],
    );
    const neededFleets = new Set<number>(
      input.include.aircraftTypes
        ? srcTypes.filter((t) => t.default_fleet_id !== null).map((t) => Number(t.default_fleet_id))
        : [],
    );

    const engineIdMap = await copyByName(
      trx,
      'engines',
      to,
      srcEngines.filter((e) => input.include.engines || neededEngines.has(Number(e.id))),
      (e) => {
        const values: Row = { created_at: now, updated_at: now };
        for (const f of ENGINE_FIELDS) values[f] = e[f];
        return values;
      },
      result.engines,
    );
    const fleetIdMap = await copyByName(
      trx,
      'fleets',
      to,
      srcFleets.filter((f) => input.include.fleets || neededFleets.has(Number(f.id))),
      (f) => ({ description: f.description ?? '', created_at: now }),
      result.fleets,
    );

    if (input.include.aircraftTypes) {
      const codes = new Set(
        ((await trx('aircraft_types').where(to).select('code')) as Row[]).map((t) => String(t.code).toUpperCase()),
      );
      for (const t of srcTypes) {
        const code = String(t.code);
        if (codes.has(code.toUpperCase())) {
          result.aircraftTypes.skipped.push(code);
          continue;
        }
        const values: Row = {
          ...to,
          code,
          engine_id: t.engine_id === null ? null : (engineIdMap.get(Number(t.engine_id)) ?? null),
          default_fleet_id: t.default_fleet_id === null ? null : (fleetIdMap.get(Number(t.default_fleet_id)) ?? null),
          created_at: now,
          updated_at: now,
        };
        for (const f of TYPE_FIELDS) values[f] = t[f];
        await trx('aircraft_types').insert(values);
        codes.add(code.toUpperCase());
        result.aircraftTypes.copied.push(code);
      }
    }

    const source = (await trx('workspaces').where({ id: input.fromWorkspaceId }).first('slug')) as Row | undefined;
    await createAuditEntry(
      {
        workspaceId: input.toWorkspaceId,
        userId: actor.userId,
        actor: actor.label,
        action: 'library.copied',
        target: `workspace:${String(source?.slug ?? input.fromWorkspaceId)}`,
        detail: {
          engines: result.engines.copied.length,
          aircraftTypes: result.aircraftTypes.copied.length,
          fleets: result.fleets.copied.length,
        },
      },
      trx,
    );
    return result;
  });
}
