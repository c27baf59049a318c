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

export interface MonthTrendRow {
  month: string;
  flights: number;
  noxTotalKg: number;
  noxAboveKg: number;
  ozoneCentralKg: number;
}

/**
 * Screened flights per calendar month (imported flights by flight date, saved screenings by the day
 * they were saved) for the `months` months up to this one, oldest first; months without flights are
 * present with zeros.
 */
export async function getMonthlyTrend(scope: { workspaceId: number }, months = 6): Promise<MonthTrendRow[]> {
  const { to } = monthBounds();
  const [y, m] = to.split('-').map(Number);
  const keys: string[] = [];
  for (let i = months - 1; i >= 0; i--) {
    const d = new Date(Date.UTC(y, m - 1 - i, 1));
    keys.push(d.toISOString().slice(0, 7));
  }
  const from = `${keys[0]}-01`;
  const k = db();
  const [flights, screenings] = await Promise.all([
    k('flights')
      .where({ workspace_id: scope.workspaceId, status: 'screened' })
      .whereBetween('date', [from, to])
      .groupByRaw('substr(date, 1, 7)')
      .select(k.raw('substr(date, 1, 7) as month'))
      .count({ n: '*' })
      .sum({ total: 'nox_total_kg', above: 'nox_above_kg', ozone: 'ozone_central_kg' }),
    k('screenings')
      .where({ workspace_id: scope.workspaceId })
      .whereBetween('created_at', [from, `${to}T23:59:59.999Z`])
      .groupByRaw('substr(created_at, 1, 7)')
      .select(k.raw('substr(created_at, 1, 7) as month'))
      .count({ n: '*' })
      .sum({ total: 'nox_total_kg', above: 'nox_above_kg', ozone: 'ozone_central_kg' }),
  ]);
  const rows = new Map(keys.map((month) => [month, { month, flights: 0, noxTotalKg: 0, noxAboveKg: 0, ozoneCentralKg: 0 }]));
  for (const r of [...flights, ...screenings] as { month: string; n: number | string; total: number | null; above: number | null; ozone: number | null }[]) {
    const row = rows.get(r.month);
    if (!row) continue;
    row.flights += Number(r.n);
    row.noxTotalKg += Number(r.total ?? 0);
    row.noxAboveKg += Number(r.above ?? 0);
    row.ozoneCentralKg += Number(r.ozone ?? 0);
  }
  return [...rows.values()];
}
