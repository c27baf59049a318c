import 'server-only';
import { db } from './client';
import { monthBounds } from '@/lib/clock';

export interface WorkspaceMonthSummary {
  workspaceId: number;
  /** Screenings saved this calendar month (by the day saved). */
  savedScreenings: number;
  /** Imported flights screened whose flight date is in this calendar month. */
  importedFlightsScreened: number;
  /** NOx of both of the above. */
  noxAboveKg: number;
  noxTotalKg: number;
}

/**
 * This month's figures for a set of workspaces: saved screenings (by the day saved), imported flights
 * screened (by flight date), and the NOx above the tropopause of both. Billable units are not here:
 * they count over the billing period, from the usage ledger (lib/billing/usage-summary.ts).
 */
export async function getMonthSummaries(scope: {
  workspaceIds: number[];
}): Promise<Map<number, WorkspaceMonthSummary>> {
  const out = new Map<number, WorkspaceMonthSummary>();
  if (!scope.workspaceIds.length) return out;
  for (const id of scope.workspaceIds)
    out.set(id, { workspaceId: id, savedScreenings: 0, importedFlightsScreened: 0, noxAboveKg: 0, noxTotalKg: 0 });
  const { from, to } = monthBounds();
  const k = db();
  const [flights, screenings] = await Promise.all([
    // A calendar month is whole: its imported flights' sums come from the monthly roll-ups.
    k('flight_month_rollups')
      .whereIn('workspace_id', scope.workspaceIds)
      .where('month', from.slice(0, 7))
      // Each flight once: its plan (a flown track of the same flight is its other side, not another flight).
      .where('basis', 'planned')
      .groupBy('workspace_id')
      .select('workspace_id')
      .sum({ n: 'flights', above: 'nox_above_kg', total: 'nox_total_kg' }),
    k('screenings')
      .whereIn('workspace_id', scope.workspaceIds)
      .whereBetween('created_at', [from, `${to}T23:59:59.999Z`])
      .groupBy('workspace_id')
      .select('workspace_id')
      .count({ n: '*' })
      .sum({ above: 'nox_above_kg', total: 'nox_total_kg' }),
  ]);
  type Sum = { workspace_id: number; n: number; above: number | null; total: number | null };
  const add = (rows: Sum[], field: 'savedScreenings' | 'importedFlightsScreened') => {
    for (const r of rows) {
      const s = out.get(Number(r.workspace_id));
      if (!s) continue;
      s[field] += Number(r.n);
      s.noxAboveKg += Number(r.above ?? 0);
      s.noxTotalKg += Number(r.total ?? 0);
    }
  };
  add(flights as Sum[], 'importedFlightsScreened');
  add(screenings as Sum[], 'savedScreenings');
  return out;
}

export interface MonthTrendRow {
  month: string;
  savedScreenings: number;
  importedFlightsScreened: number;
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
    k('flight_month_rollups')
      .where({ workspace_id: scope.workspaceId, basis: 'planned' })
      .whereBetween('month', [keys[0], keys[keys.length - 1]])
      .groupBy('month')
      .select('month')
      .sum({ n: 'flights', total: 'nox_total_kg', above: 'nox_above_kg', ozone: 'ozone_central_kg' }),
    k('screenings')
      .where({ workspace_id: scope.workspaceId })
      .whereBetween('created_at', [from, `${to}T23:59:59.999Z`])
      .groupByRaw('substr(created_at, 1, 7)')
      .select(k.raw('substr(created_at, 1, 7) as month'))
      .count({ n: '*' })
      .sum({ total: 'nox_total_kg', above: 'nox_above_kg', ozone: 'ozone_central_kg' }),
  ]);
  const rows = new Map<string, MonthTrendRow>(
    keys.map((month) => [
      month,
      { month, savedScreenings: 0, importedFlightsScreened: 0, noxTotalKg: 0, noxAboveKg: 0, ozoneCentralKg: 0 },
    ]),
  );
  type Sum = { month: string; n: number | string; total: number | null; above: number | null; ozone: number | null };
  const tagged = [
    ...(flights as Sum[]).map((r) => ({ r, field: 'importedFlightsScreened' as const })),
    ...(screenings as Sum[]).map((r) => ({ r, field: 'savedScreenings' as const })),
  ];
  for (const { r, field } of tagged) {
    const row = rows.get(r.month);
    if (!row) continue;
    row[field] += Number(r.n);
    row.noxTotalKg += Number(r.total ?? 0);
    row.noxAboveKg += Number(r.above ?? 0);
    row.ozoneCentralKg += Number(r.ozone ?? 0);
  }
  return [...rows.values()];
}

/** All imported flights of a workspace whose screening finished, whatever their date. */
export async function countImportedFlightsScreened(scope: { workspaceId: number }): Promise<number> {
  const r = (await db()('flight_month_rollups')
    .where({ workspace_id: scope.workspaceId })
    .sum({ n: 'flights' })
    .first()) as { n: number | string | null } | undefined;
  return Number(r?.n ?? 0);
}

export interface ClientStatus {
  workspaceId: number;
  /** Last six calendar months, oldest first: NOx above the tropopause and its share of all NOx. */
  trend: { month: string; noxAboveKg: number; shareAbove: number | null }[];
  imports: { running: number; failed: number };
  lastReportSent: { at: string; reportId: number; reportName: string; recipients: number } | null;
}

/** What a consultant manages clients by, for workspaces whose flight data the caller may read. */
export async function getClientStatuses(scope: { workspaceIds: number[] }): Promise<Map<number, ClientStatus>> {
  const out = new Map<number, ClientStatus>();
  if (!scope.workspaceIds.length) return out;
  const k = db();
  const [trends, imports, sends] = await Promise.all([
    Promise.all(scope.workspaceIds.map(async (id) => [id, await getMonthlyTrend({ workspaceId: id }, 6)] as const)),
    k('imports')
      .whereIn('workspace_id', scope.workspaceIds)
      .whereIn('status', ['queued', 'screening', 'failed'])
      .groupBy('workspace_id', 'status')
      .select('workspace_id', 'status')
      .count({ n: '*' }),
    k('report_sends as s')
      .join('reports as r', 'r.id', 's.report_id')
      .whereIn('r.workspace_id', scope.workspaceIds)
      .where('s.status', 'sent')
      .orderBy('s.sent_at', 'desc')
      .orderBy('s.id', 'desc')
      .select('r.workspace_id', 'r.id as report_id', 'r.name', 's.sent_at', 's.recipients'),
  ]);
  for (const [id, trend] of trends) {
    out.set(id, {
      workspaceId: id,
      trend: trend.map((t) => ({
        month: t.month,
        noxAboveKg: t.noxAboveKg,
        shareAbove: t.noxTotalKg > 0 ? t.noxAboveKg / t.noxTotalKg : null,
      })),
      imports: { running: 0, failed: 0 },
      lastReportSent: null,
    });
  }
  for (const r of imports as { workspace_id: number; status: string; n: number | string }[]) {
    const s = out.get(Number(r.workspace_id));
    if (!s) continue;
    if (r.status === 'failed') s.imports.failed += Number(r.n);
    else s.imports.running += Number(r.n);
  }
  for (const r of sends as {
    workspace_id: number;
    report_id: number;
    name: string;
    sent_at: string;
    recipients: string;
  }[]) {
    const s = out.get(Number(r.workspace_id));
    if (!s || s.lastReportSent) continue;
    s.lastReportSent = {
      at: String(r.sent_at),
      reportId: Number(r.report_id),
      reportName: String(r.name),
      recipients: recipientCount(r.recipients),
    };
  }
  return out;
}

function recipientCount(json: string): number {
  try {
    const list: unknown = JSON.parse(json);
    return Array.isArray(list) ? list.length : 0;
  } catch {
    return 0;
  }
}
