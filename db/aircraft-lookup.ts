import 'server-only';
import type { Knex } from 'knex';
import { db } from './client';
import { queryAircraftForScreening, type AircraftForScreening } from './aircraft-for-screening';

export type { AircraftEmission, AircraftForScreening } from './aircraft-for-screening';

/** Aircraft types of a workspace with what screening needs of each, keyed by upper-case code. */
export async function listAircraftForScreening(
  scope: { workspaceId: number },
  trx: Knex | Knex.Transaction = db(),
): Promise<Map<string, AircraftForScreening>> {
  return queryAircraftForScreening(trx, scope.workspaceId);
}

export async function getAircraftForScreening(
  scope: { workspaceId: number },
  code: string,
): Promise<AircraftForScreening | null> {
  return (await listAircraftForScreening(scope)).get(code.trim().toUpperCase()) ?? null;
}
