import 'server-only';
import { db } from './client';
import { monthBounds } from '@/lib/clock';

export interface WorkspaceMonthSummary {
  workspaceId: number;
  flightsScreened: number;
  noxAboveKg: number;
  noxTotalKg: number;
  units: number;
}

/**
 * This month's figures for a set of workspaces: screened flights (saved screenings plus imported
 * flights screened), their NOx above the tropopause, and billable units in the usage ledger.
 */
export async function getMonthSummaries(scope: { workspaceIds: number[] }): Promise<Map<number, WorkspaceMonthSummary>> {
  const out = new Map<number, WorkspaceMonthSummary>();
  if (!scope.workspaceIds.length) return out;
  for (const id of scope.workspaceIds) out.set(id, { workspaceId: id, flightsScreened: 0, noxAboveKg: 0, noxTotalKg: 0, units: 0 });
  const { from, to } = monthBounds();
  const k = db();
  const [flights, screenings, usage] = await Promise.all([
    k('flights')
      .whereIn('workspace_id', scope.workspaceIds)
      .where('status', 'screened')
      .whereBetween('date', [from, to])
      .groupBy('workspace_id')
      .select('workspace_id')
      .count({ n: '*' })
      .sum({ above: 'nox_above_kg', total: 'nox_total_kg' }),
    k('screenings')
      .whereIn('workspace_id', scope.workspaceIds)
      .whereBetween('created_at', [from, `${to}T23:59:59.999Z`])
      .groupBy('workspace_id')
      .select('workspace_id')
      .count({ n: '*' })
      .sum({ above: 'nox_above_kg', total: 'nox_total_kg' }),
    k('usage_events')
      .whereIn('workspace_id', scope.workspaceIds)
      .whereBetween('occurred_at', [from, `${to}T23:59:59.999Z`])
      .groupBy('workspace_id')
      .select('workspace_id')
      .sum({ units: 'quantity' }),
  ]);
  for (const r of [...flights, ...screenings] as { workspace_id: number; n: number; above: number | null; total: number | null }[]) {
    const s = out.get(Number(r.workspace_id));
    if (!s) continue;
    s.flightsScreened += Number(r.n);
    s.noxAboveKg += Number(r.above ?? 0);
    s.noxTotalKg += Number(r.total ?? 0);
  }
  for (const r of usage as { workspace_id: number; units: number | null }[]) {
    const s = out.get(Number(r.workspace_id));
    if (s) s.units = Number(r.units ?? 0);
  }
  return out;
}
