import 'server-only';
import type { Knex } from 'knex';
import { notFound } from '@/lib/errors';

/** Small queries every workspace-owned table (engines, routes, soundings, fleets) shares. */

type Db = Knex | Knex.Transaction;
type Row = Record<string, unknown>;

/** The rows of `table` in the workspace, by `column` then id, both in `direction`. */
export async function rowsInWorkspace(
  trx: Db,
  table: string,
  scope: { workspaceId: number },
  column: string,
  direction: 'asc' | 'desc',
): Promise<Row[]> {
  return (await trx(table)
    .where({ workspace_id: scope.workspaceId })
    .orderBy(column, direction)
    .orderBy('id', direction)) as Row[];
}

/** Row `id` of `table` if it is in the workspace; else 404 with `missing` as the message. */
export async function rowInWorkspace(
  trx: Db,
  table: string,
  scope: { workspaceId: number },
  id: number,
  missing: string,
): Promise<Row> {
  const row = (await trx(table).where({ workspace_id: scope.workspaceId, id }).first()) as Row | undefined;
  if (!row) throw notFound(missing);
  return row;
}

/** Whether another row of `table` in the workspace (not `exceptId`) has this name, in any case. */
export async function nameTaken(
  trx: Db,
  table: string,
  workspaceId: number,
  name: string,
  exceptId?: number,
): Promise<boolean> {
  const q = trx(table).where({ workspace_id: workspaceId }).whereRaw('lower(name) = ?', [name.toLowerCase()]);
  if (exceptId !== undefined) q.andWhereNot('id', exceptId);
  return !!(await q.first());
}
