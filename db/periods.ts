import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso } from './client';
import { flightsWithFleet } from './fleets';

type Trx = Knex | Knex.Transaction;
type Row = Record<string, unknown>;

export type PeriodKindDb = 'month' | 'quarter' | 'year' | 'custom';
export type PeriodStateDb = 'open' | 'review' | 'signed';

/** A stored reporting period (calendar periods get a row on first use). */
export interface PeriodRow {
  id: number;
  kind: PeriodKindDb;
  key: string;
  name: string;
  from: string;
  to: string;
  state: PeriodStateDb;
  frozenAt: string | null;
  frozenByName: string | null;
  signedAt: string | null;
  signedByName: string | null;
  signHash: string | null;
  createdAt: string;
}

const str = (v: unknown): string | null => (v === null || v === undefined ? null : String(v));
const num = (v: unknown): number => (v === null || v === undefined ? 0 : Number(v));

function toPeriod(r: Row): PeriodRow {
  return {
    id: Number(r.id),
    kind: r.kind as PeriodKindDb,
    key: String(r.key),
    name: String(r.name),
    from: String(r.date_from),
    to: String(r.date_to),
    state: r.state as PeriodStateDb,
    frozenAt: str(r.frozen_at),
    frozenByName: str(r.frozen_by_name),
    signedAt: str(r.signed_at),
    signedByName: str(r.signed_by_name),
    signHash: str(r.sign_hash),
    createdAt: String(r.created_at),
  };
}

export async function getPeriodByKey(
  scope: { workspaceId: number },
  key: string,
  trx: Trx = db(),
): Promise<PeriodRow | null> {
  const r = (await trx('reporting_periods').where({ workspace_id: scope.workspaceId, key }).first()) as Row | undefined;
  return r ? toPeriod(r) : null;
}

export async function listPeriodRows(scope: { workspaceId: number }): Promise<PeriodRow[]> {
  const rows = (await db()('reporting_periods')
    .where({ workspace_id: scope.workspaceId })
    .orderBy([
      { column: 'date_from', order: 'desc' },
      { column: 'id', order: 'desc' },
    ])) as Row[];
  return rows.map(toPeriod);
}

/** Makes the row of a calendar period when it has none yet; returns the row either way. */
export async function ensurePeriodRow(
  scope: { workspaceId: number },
  p: { kind: PeriodKindDb; key: string; name: string; from: string; to: string; createdBy: number | null },
  trx: Trx,
): Promise<PeriodRow> {
  const now = nowIso();
  await trx('reporting_periods')
    .insert({
      workspace_id: scope.workspaceId,
      kind: p.kind,
      key: p.key,
      name: p.name,
      date_from: p.from,
      date_to: p.to,
      state: 'open',
      created_by: p.createdBy,
      created_at: now,
      updated_at: now,
    })
    .onConflict(['workspace_id', 'key'])
    .ignore();
  const row = await getPeriodByKey(scope, p.key, trx);
  if (!row) throw new Error('period row missing after insert');
  return row;
}

/** A custom period; its key is `c{id}`. */
export async function createCustomPeriodRow(
  scope: { workspaceId: number },
  p: { name: string; from: string; to: string; createdBy: number | null },
  trx: Trx,
): Promise<PeriodRow> {
  const now = nowIso();
  const id = await insertId(
    trx('reporting_periods')
      .insert({
        workspace_id: scope.workspaceId,
        kind: 'custom',
        key: `new-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 8)}`,
        name: p.name,
        date_from: p.from,
        date_to: p.to,
        state: 'open',
        created_by: p.createdBy,
        created_at: now,
        updated_at: now,
      })
      .returning('id'),
  );
  await trx('reporting_periods')
    .where({ id })
    .update({ key: `c${id}` });
  const row = await getPeriodByKey(scope, `c${id}`, trx);
  if (!row) throw new Error('custom period missing after insert');
  return row;
}

export interface PeriodStatePatch {
  state: PeriodStateDb;
  frozenAt?: string | null;
  frozenByName?: string | null;
  signedAt?: string | null;
  signedBy?: number | null;
  signedByName?: string | null;
  signHash?: string | null;
}

/** Moves a period from one state to another; false when it was no longer in `from` (a concurrent change). */
export async function updatePeriodState(
  scope: { workspaceId: number },
  id: number,
  fromStates: PeriodStateDb[],
  patch: PeriodStatePatch,
  trx: Trx,
): Promise<boolean> {
  const values: Row = { state: patch.state, updated_at: nowIso() };
  if (patch.frozenAt !== undefined) values.frozen_at = patch.frozenAt;
  if (patch.frozenByName !== undefined) values.frozen_by_name = patch.frozenByName;
  if (patch.signedAt !== undefined) values.signed_at = patch.signedAt;
  if (patch.signedBy !== undefined) values.signed_by = patch.signedBy;
  if (patch.signedByName !== undefined) values.signed_by_name = patch.signedByName;
  if (patch.signHash !== undefined) values.sign_hash = patch.signHash;
  const n = await trx('reporting_periods')
    .where({ workspace_id: scope.workspaceId, id })
    .whereIn('state', fromStates)
    .update(values);
  return n > 0;
}

/** Years (YYYY) in which the workspace has flights, newest first. */
export async function listFlightYears(scope: { workspaceId: number }): Promise<number[]> {
  const rows = (await db()('flights')
    .where({ workspace_id: scope.workspaceId })
    .distinct(db().raw('substr(date, 1, 4) as y'))
    .orderBy('y', 'desc')) as Row[];
  return rows.map((r) => Number(r.y)).filter((y) => Number.isInteger(y));
}

export async function countUnscreenedFlights(
  scope: { workspaceId: number },
  range: { from: string; to: string },
  trx: Trx = db(),
): Promise<number> {
  const r = (await trx('flights')
    .where({ workspace_id: scope.workspaceId, status: 'pending', basis: 'planned' })
    .whereBetween('date', [range.from, range.to])
    .count({ n: '*' })
    .first()) as Row | undefined;
  return num(r?.n);
}

/** A flight as frozen in a period. */
export interface FrozenFlight {
  flightId: number;
  importId: number | null;
  date: string;
  flight: string;
  origin: string;
  destination: string;
  aircraftCode: string;
  fleetId: number | null;
  fleetName: string | null;
  cruiseFl: number;
  maxFl: number;
  fuelKg: number;
  distanceKm: number;
  noxTotalKg: number;
  noxAboveKg: number;
  ozoneCentralKg: number;
  ozoneLowKg: number;
  ozoneHighKg: number;
  engineVersion: string;
  screenedAt: string;
}

function toFrozen(r: Row): FrozenFlight {
  return {
    flightId: Number(r.flight_id),
    importId: r.import_id === null || r.import_id === undefined ? null : Number(r.import_id),
    date: String(r.date),
    flight: String(r.flight),
    origin: String(r.origin),
    destination: String(r.destination),
    aircraftCode: String(r.aircraft_code),
    fleetId: r.fleet_id === null || r.fleet_id === undefined ? null : Number(r.fleet_id),
    fleetName: str(r.fleet_name),
    cruiseFl: Number(r.cruise_fl),
    maxFl: Number(r.max_fl),
    fuelKg: num(r.fuel_kg),
    distanceKm: num(r.distance_km),
    noxTotalKg: num(r.nox_total_kg),
    noxAboveKg: num(r.nox_above_kg),
    ozoneCentralKg: num(r.ozone_central_kg),
    ozoneLowKg: num(r.ozone_low_kg),
    ozoneHighKg: num(r.ozone_high_kg),
    engineVersion: String(r.engine_version ?? ''),
    screenedAt: String(r.screened_at ?? ''),
  };
}

/**
 * Copies the screened flights dated in the period, with their resolved fleet, into the period's
 * frozen set (inside the freezing transaction) and returns them in the audit CSV's order.
 */
export async function freezeFlights(
  scope: { workspaceId: number },
  periodId: number,
  range: { from: string; to: string },
  trx: Knex.Transaction,
): Promise<FrozenFlight[]> {
  const rows = (await flightsWithFleet(trx, scope.workspaceId)
    .where('fl.status', 'screened')
    // A period reports the planned basis, as the fleet comparison does by default: a flown track of
    // the same flight is its other side, not another flight.
    .where('fl.basis', 'planned')
    .whereBetween('fl.date', [range.from, range.to])
    .orderBy([
      { column: 'fl.date', order: 'asc' },
      { column: 'fl.flight', order: 'asc' },
      { column: 'fl.id', order: 'asc' },
    ])
    .select(
      'fl.id as flight_id',
      'fl.import_id',
      'fl.date',
      'fl.flight',
      'fl.origin',
      'fl.destination',
      'fl.aircraft_code',
      'f.id as fleet_id',
      'f.name as fleet_name',
      'fl.cruise_fl',
      'fl.max_fl',
      'fl.fuel_kg',
      'fl.distance_km',
      'fl.nox_total_kg',
      'fl.nox_above_kg',
      'fl.ozone_central_kg',
      'fl.ozone_low_kg',
      'fl.ozone_high_kg',
      'fl.engine_version',
      'fl.screened_at',
    )) as Row[];
  const flights = rows.map(toFrozen);
  const records = flights.map((f) => ({
    period_id: periodId,
    flight_id: f.flightId,
    import_id: f.importId,
    date: f.date,
    flight: f.flight,
    origin: f.origin,
    destination: f.destination,
    aircraft_code: f.aircraftCode,
    fleet_id: f.fleetId,
    fleet_name: f.fleetName,
    cruise_fl: f.cruiseFl,
    max_fl: f.maxFl,
    fuel_kg: f.fuelKg,
    distance_km: f.distanceKm,
    nox_total_kg: f.noxTotalKg,
    nox_above_kg: f.noxAboveKg,
    ozone_central_kg: f.ozoneCentralKg,
    ozone_low_kg: f.ozoneLowKg,
    ozone_high_kg: f.ozoneHighKg,
    engine_version: f.engineVersion,
    screened_at: f.screenedAt,
  }));
  // 21 columns a row: stay well under SQLite's and PostgreSQL's bound-parameter limits.
  for (let i = 0; i < records.length; i += 400) await trx('period_flights').insert(records.slice(i, i + 400));
  return flights;
}

export async function listFrozenFlights(
  periodId: number,
  opts: { limit?: number } = {},
  trx: Trx = db(),
): Promise<FrozenFlight[]> {
  const q = trx('period_flights')
    .where({ period_id: periodId })
    .orderBy([
      { column: 'date', order: 'asc' },
      { column: 'flight', order: 'asc' },
      { column: 'flight_id', order: 'asc' },
    ]);
  if (opts.limit) q.limit(opts.limit);
  return ((await q) as Row[]).map(toFrozen);
}

/** Sums a set of flights per fleet. */
export interface FleetSums {
  fleetId: number | null;
  fleetName: string | null;
  flights: number;
  distanceKm: number;
  noxTotalKg: number;
  noxAboveKg: number;
}

export async function sumFrozenByFleet(periodId: number): Promise<FleetSums[]> {
  const rows = (await db()('period_flights')
    .where({ period_id: periodId })
    .groupBy('fleet_id', 'fleet_name')
    .select('fleet_id', 'fleet_name')
    .count({ n: '*' })
    .sum({ d: 'distance_km', nox: 'nox_total_kg', above: 'nox_above_kg' })) as Row[];
  return rows.map((r) => ({
    fleetId: r.fleet_id === null || r.fleet_id === undefined ? null : Number(r.fleet_id),
    fleetName: str(r.fleet_name),
    flights: num(r.n),
    distanceKm: num(r.d),
    noxTotalKg: num(r.nox),
    noxAboveKg: num(r.above),
  }));
}

export interface SnapshotRecord {
  frozenAt: string;
  flights: number;
  engineVersions: { engineVersion: string; flights: number }[];
  assumptions: { method: string[]; sources: string[] };
  summaryJson: string;
  targets: unknown[];
  pdf: Uint8Array;
  csv: string;
  csvSha256: string;
}

export async function insertSnapshot(periodId: number, s: SnapshotRecord, trx: Knex.Transaction): Promise<void> {
  await trx('period_snapshots').insert({
    period_id: periodId,
    frozen_at: s.frozenAt,
    flights: s.flights,
    engine_versions_json: JSON.stringify(s.engineVersions),
    assumptions_json: JSON.stringify(s.assumptions),
    summary_json: s.summaryJson,
    targets_json: JSON.stringify(s.targets),
    pdf: Buffer.from(s.pdf),
    csv: s.csv,
    csv_sha256: s.csvSha256,
  });
}

export interface SnapshotInfo {
  frozenAt: string;
  flights: number;
  engineVersions: { engineVersion: string; flights: number }[];
  assumptions: { method: string[]; sources: string[] };
  targets: unknown[];
  csvSha256: string;
  pdfBytes: number;
}

export async function getSnapshotInfo(periodId: number, trx: Trx = db()): Promise<SnapshotInfo | null> {
  const r = (await trx('period_snapshots')
    .where({ period_id: periodId })
    .first(
      'frozen_at',
      'flights',
      'engine_versions_json',
      'assumptions_json',
      'targets_json',
      'csv_sha256',
      trx.raw('length(pdf) as pdf_bytes'),
    )) as Row | undefined;
  if (!r) return null;
  return {
    frozenAt: String(r.frozen_at),
    flights: Number(r.flights),
    engineVersions: JSON.parse(String(r.engine_versions_json)) as SnapshotInfo['engineVersions'],
    assumptions: JSON.parse(String(r.assumptions_json)) as SnapshotInfo['assumptions'],
    targets: JSON.parse(String(r.targets_json)) as unknown[],
    csvSha256: String(r.csv_sha256),
    pdfBytes: num(r.pdf_bytes),
  };
}

export async function getSnapshotFiles(
  periodId: number,
  trx: Trx = db(),
): Promise<{ pdf: Buffer; csv: string; csvSha256: string } | null> {
  const r = (await trx('period_snapshots').where({ period_id: periodId }).first('pdf', 'csv', 'csv_sha256')) as
    Row | undefined;
  if (!r) return null;
  return { pdf: Buffer.from(r.pdf as Uint8Array), csv: String(r.csv), csvSha256: String(r.csv_sha256) };
}

/** Drops the frozen copy (reopening). */
export async function deleteSnapshot(periodId: number, trx: Knex.Transaction): Promise<void> {
  await trx('period_flights').where({ period_id: periodId }).delete();
  await trx('period_snapshots').where({ period_id: periodId }).delete();
}

/** A difference between the live flights and a period's frozen copy. */
export interface AfterSignOffChange {
  kind: 'added' | 'rescreened' | 'removed';
  flightId: number;
  date: string;
  flight: string;
  origin: string;
  destination: string;
  importId: number | null;
  engineVersion: string | null;
  at: string | null;
  /** Live figure now (null when removed) and the frozen one (null when added), kg. */
  noxAboveKgNow: number | null;
  noxAboveKgFrozen: number | null;
}

/**
 * Flights dated in a frozen period that were imported (added), screened again (rescreened) after
 * the freeze, or are gone from the workspace (removed). The frozen figures never change; these are
 * what a reopening would take in.
 */
export async function listChangesAfterFreeze(
  scope: { workspaceId: number },
  period: { id: number; from: string; to: string; frozenAt: string },
): Promise<AfterSignOffChange[]> {
  const k = db();
  const [live, removed] = await Promise.all([
    k('flights as fl')
      .leftJoin('period_flights as pf', function join() {
        this.on('pf.flight_id', '=', 'fl.id').andOn('pf.period_id', '=', k.raw('?', [period.id]));
      })
      .where('fl.workspace_id', scope.workspaceId)
      .where('fl.basis', 'planned')
      .whereBetween('fl.date', [period.from, period.to])
      // Anything made or screened after the freeze; a flight without a frozen copy is new.
      .where((w) => w.where('fl.created_at', '>', period.frozenAt).orWhere('fl.screened_at', '>', period.frozenAt))
      .orderBy([
        { column: 'fl.date', order: 'asc' },
        { column: 'fl.id', order: 'asc' },
      ])
      .select(
        'fl.id',
        'fl.date',
        'fl.flight',
        'fl.origin',
        'fl.destination',
        'fl.import_id',
        'fl.engine_version',
        'fl.created_at',
        'fl.screened_at',
        'fl.nox_above_kg',
        'pf.id as pf_id',
        'pf.nox_above_kg as frozen_above',
      ) as Promise<Row[]>,
    k('period_flights as pf')
      .leftJoin('flights as fl', function join() {
        this.on('fl.id', '=', 'pf.flight_id').andOn('fl.workspace_id', '=', k.raw('?', [scope.workspaceId]));
      })
      .where('pf.period_id', period.id)
      .whereNull('fl.id')
      .orderBy([
        { column: 'pf.date', order: 'asc' },
        { column: 'pf.flight_id', order: 'asc' },
      ])
      .select('pf.*') as Promise<Row[]>,
  ]);
  const out: AfterSignOffChange[] = live.map((r) => ({
    kind: r.pf_id === null || r.pf_id === undefined ? 'added' : 'rescreened',
    flightId: Number(r.id),
    date: String(r.date),
    flight: String(r.flight),
    origin: String(r.origin),
    destination: String(r.destination),
    importId: r.import_id === null || r.import_id === undefined ? null : Number(r.import_id),
    engineVersion: str(r.engine_version),
    at: str(r.screened_at) ?? str(r.created_at),
    noxAboveKgNow: r.nox_above_kg === null || r.nox_above_kg === undefined ? null : Number(r.nox_above_kg),
    noxAboveKgFrozen: r.frozen_above === null || r.frozen_above === undefined ? null : Number(r.frozen_above),
  }));
  for (const r of removed) {
    out.push({
      kind: 'removed',
      flightId: Number(r.flight_id),
      date: String(r.date),
      flight: String(r.flight),
      origin: String(r.origin),
      destination: String(r.destination),
      importId: r.import_id === null || r.import_id === undefined ? null : Number(r.import_id),
      engineVersion: str(r.engine_version),
      at: null,
      noxAboveKgNow: null,
      noxAboveKgFrozen: num(r.nox_above_kg),
    });
  }
  return out;
}

// Targets.

export interface TargetRow {
  id: number;
  periodId: number;
  fleetId: number | null;
  metric: string;
  value: number;
  alert90At: string | null;
  alert100At: string | null;
  updatedAt: string;
}

function toTarget(r: Row): TargetRow {
  return {
    id: Number(r.id),
    periodId: Number(r.period_id),
    fleetId: r.fleet_id === null || r.fleet_id === undefined ? null : Number(r.fleet_id),
    metric: String(r.metric),
    value: Number(r.value),
    alert90At: str(r.alert_90_at),
    alert100At: str(r.alert_100_at),
    updatedAt: String(r.updated_at),
  };
}

export async function listTargets(
  scope: { workspaceId: number },
  periodIds: number[],
  trx: Trx = db(),
): Promise<TargetRow[]> {
  if (!periodIds.length) return [];
  const rows = (await trx('period_targets')
    .where({ workspace_id: scope.workspaceId })
    .whereIn('period_id', periodIds)
    .orderBy([
      { column: 'period_id', order: 'asc' },
      { column: 'fleet_key', order: 'asc' },
      { column: 'metric', order: 'asc' },
    ])) as Row[];
  return rows.map(toTarget);
}

/**
 * Replaces a period's targets. A target whose value is unchanged keeps its sent alerts; a changed
 * or new one starts without, so its thresholds are e-mailed again once reached.
 */
export async function replaceTargets(
  scope: { workspaceId: number },
  periodId: number,
  targets: { fleetId: number | null; metric: string; value: number }[],
  by: number | null,
  trx: Knex.Transaction,
): Promise<void> {
  const existing = await listTargets(scope, [periodId], trx);
  const keyOf = (t: { fleetId: number | null; metric: string }) => `${t.fleetId ?? 0}:${t.metric}`;
  const wanted = new Map(targets.map((t) => [keyOf(t), t]));
  const now = nowIso();
  for (const e of existing) {
    const w = wanted.get(keyOf(e));
    if (!w) await trx('period_targets').where({ id: e.id }).delete();
    else if (w.value !== e.value)
      await trx('period_targets')
        .where({ id: e.id })
        .update({ value: w.value, alert_90_at: null, alert_100_at: null, updated_by: by, updated_at: now });
    wanted.delete(keyOf(e));
  }
  for (const t of wanted.values()) {
    await trx('period_targets').insert({
      workspace_id: scope.workspaceId,
      period_id: periodId,
      fleet_id: t.fleetId,
      fleet_key: t.fleetId ?? 0,
      metric: t.metric,
      value: t.value,
      updated_by: by,
      updated_at: now,
    });
  }
}

/** Targets of the workspace's open periods (the ones whose running figures can still move). */
export async function listOpenPeriodTargets(scope: {
  workspaceId: number;
}): Promise<(TargetRow & { period: PeriodRow })[]> {
  const rows = (await db()('period_targets as t')
    .join('reporting_periods as p', 'p.id', 't.period_id')
    .where('t.workspace_id', scope.workspaceId)
    .where('p.state', 'open')
    .select('t.*', 'p.key as p_key')) as Row[];
  const periods = new Map<string, PeriodRow>();
  for (const key of new Set(rows.map((r) => String(r.p_key)))) {
    const p = await getPeriodByKey(scope, key);
    if (p) periods.set(key, p);
  }
  return rows.flatMap((r) => {
    const period = periods.get(String(r.p_key));
    return period ? [{ ...toTarget(r), period }] : [];
  });
}

/** Marks a threshold of a target as e-mailed; true only for the one caller that marked it. */
export async function claimTargetAlert(targetId: number, threshold: 90 | 100, trx: Trx = db()): Promise<boolean> {
  const column = threshold === 90 ? 'alert_90_at' : 'alert_100_at';
  const n = await trx('period_targets')
    .where({ id: targetId })
    .whereNull(column)
    .update({ [column]: nowIso() });
  return n > 0;
}

/** The e-mail addresses of the workspace's analysts (who get the target alerts). */
export async function listAnalystEmails(scope: { workspaceId: number }): Promise<string[]> {
  const rows = (await db()('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where('m.workspace_id', scope.workspaceId)
    .where('m.role', 'analyst')
    .orderBy('u.email')
    .select('u.email')) as Row[];
  return [...new Set(rows.map((r) => String(r.email).trim().toLowerCase()).filter(Boolean))];
}
