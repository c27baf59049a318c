import 'server-only';
import type { Knex } from 'knex';
import { db } from './client';

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
  tropopause: { altitudeM: number; pressureHpa: number; temperatureK: number } | null;
  createdAt: string;
}

type Row = Record<string, unknown>;

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
export async function listSoundings(scope: { workspaceId: number }, trx: Knex | Knex.Transaction = db()): Promise<SoundingDto[]> {
  const rows = await trx('soundings').where({ workspace_id: scope.workspaceId }).orderBy('created_at', 'desc').orderBy('id', 'desc');
  return rows.map(soundingOf);
}
