import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { auditChange } from './audit';
import { nameTaken, rowInWorkspace, rowsInWorkspace } from './workspace-rows';
import { clearRollupKey } from './flight-rollups';
import { conflict, invalidFields, notFound, type FieldProblem } from '@/lib/errors';
import { ltoOf, type LtoQuad } from './aircraft-for-screening';

/** An engine to store, as `engineSaveSchema` gives it. */
export interface EngineSave {
  name: string;
  fuelFlowKgS: LtoQuad;
  eiNoxGPerKg: LtoQuad;
  source: string;
}

/** An aircraft type to store, as `aircraftTypeSaveSchema` gives it (code in capitals). */
export interface AircraftTypeSave {
  code: string;
  name: string;
  engineId: number | null;
  directEiGPerKg: number | null;
  engineCount: number;
  typicalMach: number;
  typicalFlightLevel: number;
  defaultFleetId: number | null;
}

export interface EngineDto {
  id: number;
  name: string;
  /** Certification fuel flow per engine, kg/s, idle -> take-off. */
  fuelFlowKgS: LtoQuad;
  /** Certification EI NOx, g NO2 per kg fuel, idle -> take-off. */
  eiNoxGPerKg: LtoQuad;
  source: string;
  isDemo: boolean;
  createdAt: string;
  updatedAt: string;
}

export interface AircraftTypeDto {
  id: number;
  code: string;
  name: string;
  engineId: number | null;
  engineName: string | null;
  engineCount: number;
  typicalMach: number;
  typicalFlightLevel: number;
  directEiGPerKg: number | null;
  defaultFleetId: number | null;
  defaultFleetName: string | null;
}

/** Who made a change, for the audit log. */
export interface LibraryActor {
  userId: number | null;
  actor: string;
}

type Row = Record<string, unknown>;
type Db = Knex | Knex.Transaction;

export const engineOf = (r: Row): EngineDto => ({
  id: Number(r.id),
  name: String(r.name),
  ...ltoOf(r),
  source: String(r.source ?? ''),
  isDemo: Boolean(r.is_demo),
  createdAt: String(r.created_at),
  updatedAt: String(r.updated_at),
});

const nullableNumber = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

export const aircraftTypeOf = (r: Row): AircraftTypeDto => ({
  id: Number(r.id),
  code: String(r.code),
  name: String(r.name ?? ''),
  engineId: nullableNumber(r.engine_id),
  engineName: (r.engine_name as string | null) ?? null,
  engineCount: Number(r.engine_count),
  typicalMach: Number(r.typical_mach),
  typicalFlightLevel: Number(r.typical_flight_level),
  directEiGPerKg: nullableNumber(r.direct_ei_g_kg),
  defaultFleetId: nullableNumber(r.default_fleet_id),
  defaultFleetName: (r.default_fleet_name as string | null) ?? null,
});

/** Engines of a workspace, by name. */
export async function listEngines(scope: { workspaceId: number }, trx: Db = db()): Promise<EngineDto[]> {
  return (await rowsInWorkspace(trx, 'engines', scope, 'name', 'asc')).map(engineOf);
}

export async function getEngine(scope: { workspaceId: number }, id: number, trx: Db = db()): Promise<EngineDto> {
  return engineOf(await rowInWorkspace(trx, 'engines', scope, id, 'No engine with that id in this workspace.'));
}

const engineColumns = (e: EngineSave) => ({
  name: e.name,
  ff_idle_kg_s: e.fuelFlowKgS[0],
  ff_approach_kg_s: e.fuelFlowKgS[1],
  ff_climb_out_kg_s: e.fuelFlowKgS[2],
  ff_take_off_kg_s: e.fuelFlowKgS[3],
  ei_idle_g_kg: e.eiNoxGPerKg[0],
  ei_approach_g_kg: e.eiNoxGPerKg[1],
  ei_climb_out_g_kg: e.eiNoxGPerKg[2],
  ei_take_off_g_kg: e.eiNoxGPerKg[3],
  source: e.source,
});

/** Names already used by engines of the workspace (lower-case), for the CSV import's duplicate check. */
export async function engineNamesInUse(scope: { workspaceId: number }, trx: Db = db()): Promise<Set<string>> {
  const rows = (await trx('engines').where({ workspace_id: scope.workspaceId }).select('name')) as Row[];
  return new Set(rows.map((r) => String(r.name).toLowerCase()));
}

async function assertEngineNameFree(trx: Db, workspaceId: number, name: string, exceptId?: number): Promise<void> {
  if (await nameTaken(trx, 'engines', workspaceId, name, exceptId))
    throw conflict(`An engine called “${name}” already exists in this workspace.`, [
      { path: 'name', message: 'Another engine already has this name.' },
    ]);
}

export async function createEngine(
  scope: { workspaceId: number },
  input: EngineSave,
  by: LibraryActor,
): Promise<EngineDto> {
  return writeTx(async (trx) => {
    await assertEngineNameFree(trx, scope.workspaceId, input.name);
    const now = nowIso();
    const id = await insertId(
      trx('engines').insert(
        { workspace_id: scope.workspaceId, ...engineColumns(input), is_demo: false, created_at: now, updated_at: now },
        ['id'],
      ),
    );
    await auditChange(trx, scope, by, {
      action: 'engine.create',
      target: `engine:${id}`,
      detail: { name: input.name },
    });
    return getEngine(scope, id, trx);
  });
}

/**
 * Adds several engines in one transaction (the CSV import): all or none. Names must be free; the
 * import checks them per line first, this re-checks inside the transaction.
 */
export async function createEngines(
  scope: { workspaceId: number },
  inputs: readonly EngineSave[],
  by: LibraryActor & { fileName?: string },
): Promise<EngineDto[]> {
  return writeTx(async (trx) => {
    const ids: number[] = [];
    const now = nowIso();
    for (const input of inputs) {
      await assertEngineNameFree(trx, scope.workspaceId, input.name);
      ids.push(
        await insertId(
          trx('engines').insert(
            {
              workspace_id: scope.workspaceId,
              ...engineColumns(input),
              is_demo: false,
              created_at: now,
              updated_at: now,
            },
            ['id'],
          ),
        ),
      );
    }
    await auditChange(trx, scope, by, {
      action: 'engine.import',
      target: by.fileName ?? null,
      detail: { engines: inputs.length },
    });
    const rows = (await trx('engines')
      .where({ workspace_id: scope.workspaceId })
      .whereIn('id', ids)
      .orderBy('id', 'asc')) as Row[];
    return rows.map(engineOf);
  });
}

/** Replaces an engine's values; a demo engine edited by hand is no longer marked as demo data. */
export async function updateEngine(
  scope: { workspaceId: number },
  id: number,
  input: EngineSave,
  by: LibraryActor,
): Promise<EngineDto> {
  return writeTx(async (trx) => {
    await getEngine(scope, id, trx);
    await assertEngineNameFree(trx, scope.workspaceId, input.name, id);
    await trx('engines')
      .where({ workspace_id: scope.workspaceId, id })
      .update({ ...engineColumns(input), is_demo: false, updated_at: nowIso() });
    await auditChange(trx, scope, by, {
      action: 'engine.update',
      target: `engine:${id}`,
      detail: { name: input.name },
    });
    return getEngine(scope, id, trx);
  });
}

/** Deletes an engine; 409 naming the aircraft types that still use it (the foreign key is RESTRICT). */
export async function deleteEngine(scope: { workspaceId: number }, id: number, by: LibraryActor): Promise<void> {
  await writeTx(async (trx) => {
    const engine = await getEngine(scope, id, trx);
    const users = (await trx('aircraft_types')
      .where({ workspace_id: scope.workspaceId, engine_id: id })
      .orderBy('code', 'asc')
      .select('code')) as Row[];
    if (users.length) {
      const codes = users.map((u) => String(u.code));
      throw conflict(
        `“${engine.name}” is the engine of ${codes.length === 1 ? 'aircraft type' : 'aircraft types'} ${codes.join(', ')}. Give ${codes.length === 1 ? 'that type' : 'those types'} another engine, or delete ${codes.length === 1 ? 'it' : 'them'}, first.`,
      );
    }
    await trx('engines').where({ workspace_id: scope.workspaceId, id }).delete();
    await auditChange(trx, scope, by, {
      action: 'engine.delete',
      target: `engine:${id}`,
      detail: { name: engine.name },
    });
  });
}

// ---------------------------------------------------------------------------------------------
// Aircraft types

export function aircraftTypeQuery(trx: Db, workspaceId: number): Knex.QueryBuilder {
  return trx('aircraft_types as a')
    .leftJoin('engines as e', 'e.id', 'a.engine_id')
    .leftJoin('fleets as f', 'f.id', 'a.default_fleet_id')
    .where('a.workspace_id', workspaceId)
    .select('a.*', 'e.name as engine_name', 'f.name as default_fleet_name');
}

/** Aircraft types of a workspace with their engine's and default fleet's names, by code. */
export async function listAircraftTypes(scope: { workspaceId: number }, trx: Db = db()): Promise<AircraftTypeDto[]> {
  const rows = (await aircraftTypeQuery(trx, scope.workspaceId).orderBy('a.code', 'asc')) as Row[];
  return rows.map(aircraftTypeOf);
}

export async function getAircraftType(
  scope: { workspaceId: number },
  id: number,
  trx: Db = db(),
): Promise<AircraftTypeDto> {
  const row = (await aircraftTypeQuery(trx, scope.workspaceId).andWhere('a.id', id).first()) as Row | undefined;
  if (!row) throw notFound('No aircraft type with that id in this workspace.');
  return aircraftTypeOf(row);
}

/** Fleets a type may default to (id and name), by name. Creating fleets happens under Fleets. */
export async function listFleetChoices(
  scope: { workspaceId: number },
  trx: Db = db(),
): Promise<{ id: number; name: string }[]> {
  const rows = (await trx('fleets')
    .where({ workspace_id: scope.workspaceId })
    .orderBy('name', 'asc')
    .select('id', 'name')) as Row[];
  return rows.map((r) => ({ id: Number(r.id), name: String(r.name) }));
}

async function checkTypeReferences(trx: Db, workspaceId: number, input: AircraftTypeSave): Promise<void> {
  const problems: FieldProblem[] = [];
  if (
    input.engineId !== null &&
    !(await trx('engines').where({ workspace_id: workspaceId, id: input.engineId }).first())
  ) {
    problems.push({ path: 'engineId', message: 'That engine is not in this workspace. Choose one from the list.' });
  }
  if (
    input.defaultFleetId !== null &&
    !(await trx('fleets').where({ workspace_id: workspaceId, id: input.defaultFleetId }).first())
  ) {
    problems.push({
      path: 'defaultFleetId',
      message: 'That fleet is not in this workspace. Choose one from the list.',
    });
  }
  if (problems.length) throw invalidFields(problems);
}

async function assertCodeFree(trx: Db, workspaceId: number, code: string, exceptId?: number): Promise<void> {
  const q = trx('aircraft_types')
    .where({ workspace_id: workspaceId })
    .whereRaw('upper(code) = ?', [code.toUpperCase()]);
  if (exceptId !== undefined) q.andWhereNot('id', exceptId);
  if (await q.first())
    throw conflict(`Aircraft type ${code} already exists in this workspace.`, [
      { path: 'code', message: 'Another aircraft type already has this code.' },
    ]);
}

const typeColumns = (t: AircraftTypeSave) => ({
  code: t.code,
  name: t.name,
  engine_id: t.engineId,
  engine_count: t.engineCount,
  typical_mach: t.typicalMach,
  typical_flight_level: t.typicalFlightLevel,
  direct_ei_g_kg: t.directEiGPerKg,
  default_fleet_id: t.defaultFleetId,
});

export async function createAircraftType(
  scope: { workspaceId: number },
  input: AircraftTypeSave,
  by: LibraryActor,
): Promise<AircraftTypeDto> {
  return writeTx(async (trx) => {
    await checkTypeReferences(trx, scope.workspaceId, input);
    await assertCodeFree(trx, scope.workspaceId, input.code);
    const now = nowIso();
    const id = await insertId(
      trx('aircraft_types').insert(
        { workspace_id: scope.workspaceId, ...typeColumns(input), created_at: now, updated_at: now },
        ['id'],
      ),
    );
    await auditChange(trx, scope, by, {
      action: 'aircraft_type.create',
      target: `aircraft_type:${id}`,
      detail: { code: input.code },
    });
    return getAircraftType(scope, id, trx);
  });
}

export async function updateAircraftType(
  scope: { workspaceId: number },
  id: number,
  input: AircraftTypeSave,
  by: LibraryActor,
): Promise<AircraftTypeDto> {
  return writeTx(async (trx) => {
    await getAircraftType(scope, id, trx);
    await checkTypeReferences(trx, scope.workspaceId, input);
    await assertCodeFree(trx, scope.workspaceId, input.code, id);
    await trx('aircraft_types')
      .where({ workspace_id: scope.workspaceId, id })
      .update({ ...typeColumns(input), updated_at: nowIso() });
    await auditChange(trx, scope, by, {
      action: 'aircraft_type.update',
      target: `aircraft_type:${id}`,
      detail: { code: input.code },
    });
    return getAircraftType(scope, id, trx);
  });
}

/** Deletes a type; flights already screened keep their figures and their recorded type code. */
export async function deleteAircraftType(scope: { workspaceId: number }, id: number, by: LibraryActor): Promise<void> {
  await writeTx(async (trx) => {
    const type = await getAircraftType(scope, id, trx);
    await trx('aircraft_types').where({ workspace_id: scope.workspaceId, id }).delete();
    await clearRollupKey(trx, scope.workspaceId, 'aircraft_type_id', id);
    await auditChange(trx, scope, by, {
      action: 'aircraft_type.delete',
      target: `aircraft_type:${id}`,
      detail: { code: type.code },
    });
  });
}

/** The stored type as the form and PATCH start from. */
export function aircraftTypeSaveOf(t: AircraftTypeDto): AircraftTypeSave {
  return {
    code: t.code,
    name: t.name,
    engineId: t.engineId,
    directEiGPerKg: t.directEiGPerKg,
    engineCount: t.engineCount,
    typicalMach: t.typicalMach,
    typicalFlightLevel: t.typicalFlightLevel,
    defaultFleetId: t.defaultFleetId,
  };
}

export function engineSaveOf(e: EngineDto): EngineSave {
  return { name: e.name, fuelFlowKgS: e.fuelFlowKgS, eiNoxGPerKg: e.eiNoxGPerKg, source: e.source };
}
