import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { auditChange } from './audit';
import { rowInWorkspace, rowsInWorkspace } from './workspace-rows';
import type { LibraryActor } from './engines';

export interface SoundingLevelDto {
  altitudeM?: number;
  pressureHpa?: number;
  temperatureK: number;
}

export interface SoundingDto {
  id: number;
  name: string;
  station: string;
  observedAt: string | null;
  levels: SoundingLevelDto[];
  /** WMO (1957) first lapse-rate tropopause, or null when the sounding has none. */
  tropopause: { altitudeM: number; pressureHpa: number; temperatureK: number } | null;
  createdAt: string;
}

type Row = Record<string, unknown>;
type Db = Knex | Knex.Transaction;

export const soundingOf = (r: Row): SoundingDto => ({
  id: Number(r.id),
  name: String(r.name),
  station: String(r.station ?? ''),
  observedAt: (r.observed_at as string | null) ?? null,
  levels: JSON.parse(String(r.levels_json)) as SoundingLevelDto[],
  tropopause:
    r.tropopause_altitude_m === null || r.tropopause_altitude_m === undefined
      ? null
      : {
          altitudeM: Number(r.tropopause_altitude_m),
          pressureHpa: Number(r.tropopause_pressure_hpa),
          temperatureK: Number(r.tropopause_temperature_k),
        },
  createdAt: String(r.created_at),
});

/** Soundings of a workspace, newest first. */
export async function listSoundings(scope: { workspaceId: number }, trx: Db = db()): Promise<SoundingDto[]> {
  return (await rowsInWorkspace(trx, 'soundings', scope, 'created_at', 'desc')).map(soundingOf);
}

export async function getSounding(scope: { workspaceId: number }, id: number, trx: Db = db()): Promise<SoundingDto> {
  return soundingOf(await rowInWorkspace(trx, 'soundings', scope, id, 'No sounding with that id in this workspace.'));
}

/** What a stored sounding holds: its levels and the tropopause the service found in them. */
export interface SoundingRecord {
  name: string;
  station: string;
  observedAt: string | null;
  levels: SoundingLevelDto[];
  tropopause: SoundingDto['tropopause'];
}

/** Inserts a sounding inside the caller's write transaction, with its audit entry. */
export async function insertSounding(
  trx: Knex.Transaction,
  scope: { workspaceId: number },
  s: SoundingRecord,
  by: LibraryActor,
): Promise<SoundingDto> {
  const id = await insertId(
    trx('soundings').insert(
      {
        workspace_id: scope.workspaceId,
        name: s.name,
        station: s.station,
        observed_at: s.observedAt,
        levels_json: JSON.stringify(s.levels),
        tropopause_altitude_m: s.tropopause?.altitudeM ?? null,
        tropopause_pressure_hpa: s.tropopause?.pressureHpa ?? null,
        tropopause_temperature_k: s.tropopause?.temperatureK ?? null,
        created_by: by.userId,
        created_at: nowIso(),
      },
      ['id'],
    ),
  );
  await auditChange(trx, scope, by, {
    action: 'sounding.create',
    target: `sounding:${id}`,
    detail: { name: s.name, levels: s.levels.length },
  });
  return getSounding(scope, id, trx);
}

export async function deleteSounding(scope: { workspaceId: number }, id: number, by: LibraryActor): Promise<void> {
  await writeTx(async (trx) => {
    const s = await getSounding(scope, id, trx);
    await trx('soundings').where({ workspace_id: scope.workspaceId, id }).delete();
    await auditChange(trx, scope, by, {
      action: 'sounding.delete',
      target: `sounding:${id}`,
      detail: { name: s.name },
    });
  });
}
