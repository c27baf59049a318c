import 'server-only';
import { nowIso, writeTx } from '@/db/client';
import { createAuditEntry } from '@/db/audit';
import { aggregateFlights, listFleets } from '@/db/fleets';
import {
  countUnscreenedFlights,
  createCustomPeriodRow,
  deleteSnapshot,
  ensurePeriodRow,
  freezeFlights,
  getPeriodByKey,
  getSnapshotFiles,
  getSnapshotInfo,
  insertSnapshot,
  listChangesAfterFreeze,
  listFlightYears,
  listFrozenFlights,
  listPeriodRows,
  listTargets,
  replaceTargets,
  sumFrozenByFleet,
  updatePeriodState,
  type AfterSignOffChange,
  type FleetSums,
  type FrozenFlight,
  type PeriodRow,
  type SnapshotInfo,
  type TargetRow,
} from '@/db/periods';
import type { UnitSystem } from '@/db/users';
import { todayIso } from '@/lib/clock';
import { appUrl } from '@/lib/env';
import { conflict, invalidFields, notFound } from '@/lib/errors';
import { reportFigures, reportMethodText } from '@/lib/reports/build';
import type { ReportSummary } from '@/lib/reports/model';
import { renderReportPdf } from '@/lib/reports/pdf';
import { TARGET_METRIC_LABELS, type PeriodCreate, type TargetMetric } from '@/lib/validation/periods';
import { auditCsv, flightPageUrl, sha256Hex } from './audit-csv';
import {
  calendarPeriodsOfYear,
  customIdOf,
  parseCalendarRef,
  previousPeriods,
  type CalendarPeriod,
  type PeriodKind,
  type PeriodState,
} from './calendar';

type Scope = { workspaceId: number };

/** Who acts: the audit trail's actor and the name a sign-off records. */
export interface PeriodActor {
  userId: number | null;
  actor: string;
  name: string;
}

/** A period as pages and the API show it. */
export interface PeriodInfo {
  ref: string;
  kind: PeriodKind;
  name: string;
  from: string;
  to: string;
  state: PeriodState;
  frozenAt: string | null;
  frozenBy: string | null;
  signedAt: string | null;
  signedBy: string | null;
  signHash: string | null;
}

function infoOf(cal: CalendarPeriod | null, row: PeriodRow | null): PeriodInfo {
  const base = row
    ? { ref: row.key, kind: row.kind, name: row.name, from: row.from, to: row.to }
    : { ref: cal!.ref, kind: cal!.kind, name: cal!.name, from: cal!.from, to: cal!.to };
  return {
    ...base,
    state: row?.state ?? 'open',
    frozenAt: row?.frozenAt ?? null,
    frozenBy: row?.frozenByName ?? null,
    signedAt: row?.signedAt ?? null,
    signedBy: row?.signedByName ?? null,
    signHash: row?.signHash ?? null,
  };
}

/** A reference -> the period and its row (null for a calendar period never used); 404 when there is none. */
export async function resolvePeriodRef(
  scope: Scope,
  ref: string,
): Promise<{ info: PeriodInfo; row: PeriodRow | null; calendar: CalendarPeriod | null }> {
  const cal = parseCalendarRef(ref);
  if (cal) {
    const row = await getPeriodByKey(scope, cal.ref);
    return { info: infoOf(cal, row), row, calendar: cal };
  }
  if (customIdOf(ref) === null) throw notFound('No such reporting period.');
  const row = await getPeriodByKey(scope, ref);
  if (!row) throw notFound('No such reporting period in this workspace.');
  return { info: infoOf(null, row), row, calendar: null };
}

// Figures.

export interface PeriodFigures {
  flights: number;
  distanceKm: number;
  noxTotalKg: number;
  noxAboveKg: number;
  shareAbove: number | null;
  noxAbovePer1000KmKg: number | null;
}

function figuresOf(s: Omit<FleetSums, 'fleetId' | 'fleetName'>): PeriodFigures {
  return {
    flights: s.flights,
    distanceKm: s.distanceKm,
    noxTotalKg: s.noxTotalKg,
    noxAboveKg: s.noxAboveKg,
    shareAbove: s.noxTotalKg > 0 ? s.noxAboveKg / s.noxTotalKg : null,
    noxAbovePer1000KmKg: s.distanceKm > 0 ? (s.noxAboveKg / s.distanceKm) * 1000 : null,
  };
}

/** A figure in the unit its target is given in (t, %, kg per 1000 km). */
export function metricValue(f: PeriodFigures, metric: TargetMetric): number | null {
  if (metric === 'noxAboveT') return f.noxAboveKg / 1000;
  if (metric === 'shareAbovePct') return f.shareAbove === null ? null : f.shareAbove * 100;
  return f.noxAbovePer1000KmKg;
}

export interface PeriodFigureSet {
  source: 'frozen' | 'running';
  total: PeriodFigures;
  fleets: (PeriodFigures & { fleetId: number | null; fleetName: string })[];
}

async function sumsOf(scope: Scope, info: PeriodInfo, row: PeriodRow | null): Promise<FleetSums[]> {
  if (row && info.state !== 'open') return sumFrozenByFleet(row.id);
  const agg = await aggregateFlights(scope, { from: info.from, to: info.to });
  return agg.map((a) => ({
    fleetId: a.fleetId,
    fleetName: a.fleetName,
    flights: a.flights,
    distanceKm: a.distanceKm,
    noxTotalKg: a.noxTotalKg,
    noxAboveKg: a.noxAboveKg,
  }));
}

/** The period's figures: frozen once in review or signed, else running over the live flights. */
export async function periodFigures(scope: Scope, info: PeriodInfo, row: PeriodRow | null): Promise<PeriodFigureSet> {
  const sums = await sumsOf(scope, info, row);
  const total = sums.reduce(
    (a, s) => ({
      flights: a.flights + s.flights,
      distanceKm: a.distanceKm + s.distanceKm,
      noxTotalKg: a.noxTotalKg + s.noxTotalKg,
      noxAboveKg: a.noxAboveKg + s.noxAboveKg,
    }),
    { flights: 0, distanceKm: 0, noxTotalKg: 0, noxAboveKg: 0 },
  );
  return {
    source: row && info.state !== 'open' ? 'frozen' : 'running',
    total: figuresOf(total),
    fleets: sums
      .map((s) => ({ ...figuresOf(s), fleetId: s.fleetId, fleetName: s.fleetName ?? 'No fleet' }))
      .sort((a, b) => (a.fleetId === null ? 1 : b.fleetId === null ? -1 : a.fleetName.localeCompare(b.fleetName))),
  };
}

export type TargetStatus = 'on-track' | 'near' | 'over' | 'no-data';

export interface TargetView {
  fleetId: number | null;
  fleetName: string;
  metric: TargetMetric;
  label: string;
  unit: string;
  target: number;
  actual: number | null;
  /** actual / target; 0.9 and 1 are the alert thresholds. */
  ratio: number | null;
  status: TargetStatus;
}

export function targetStatus(ratio: number | null): TargetStatus {
  if (ratio === null) return 'no-data';
  if (ratio >= 1) return 'over';
  if (ratio >= 0.9) return 'near';
  return 'on-track';
}

function targetViews(targets: TargetRow[], figures: PeriodFigureSet, fleetNames: Map<number, string>): TargetView[] {
  return targets.map((t) => {
    const metric = t.metric as TargetMetric;
    const f =
      t.fleetId === null
        ? figures.total
        : (figures.fleets.find((x) => x.fleetId === t.fleetId) ??
          figuresOf({ flights: 0, distanceKm: 0, noxTotalKg: 0, noxAboveKg: 0 }));
    const actual = metricValue(f, metric);
    const ratio = actual === null ? null : actual / t.value;
    return {
      fleetId: t.fleetId,
      fleetName: t.fleetId === null ? 'All fleets' : (fleetNames.get(t.fleetId) ?? `Fleet ${t.fleetId}`),
      metric,
      label: TARGET_METRIC_LABELS[metric].label,
      unit: TARGET_METRIC_LABELS[metric].unit,
      target: t.value,
      actual,
      ratio,
      status: targetStatus(ratio),
    };
  });
}

async function fleetNameMap(scope: Scope): Promise<Map<number, string>> {
  return new Map((await listFleets(scope)).map((f) => [f.id, f.name]));
}

// Lists and views.

export interface PeriodListing {
  years: { year: number; periods: PeriodInfo[] }[];
  custom: PeriodInfo[];
}

/** Calendar periods of every year with flights (and the current one), with their state, and the custom periods. */
export async function listPeriods(scope: Scope): Promise<PeriodListing> {
  const [years, rows] = await Promise.all([listFlightYears(scope), listPeriodRows(scope)]);
  const byKey = new Map(rows.map((r) => [r.key, r]));
  const allYears = [...new Set([Number(todayIso().slice(0, 4)), ...years])].sort((a, b) => b - a);
  return {
    years: allYears.map((year) => ({
      year,
      periods: calendarPeriodsOfYear(year).map((c) => infoOf(c, byKey.get(c.ref) ?? null)),
    })),
    custom: rows.filter((r) => r.kind === 'custom').map((r) => infoOf(null, r)),
  };
}

export interface TrendPoint {
  ref: string;
  name: string;
  state: PeriodState;
  figures: PeriodFigures;
  targets: { metric: TargetMetric; target: number; actual: number | null; status: TargetStatus }[];
}

export interface PeriodView {
  period: PeriodInfo;
  figures: PeriodFigureSet;
  targets: TargetView[];
  trend: TrendPoint[];
  snapshot: SnapshotInfo | null;
  changesAfterFreeze: AfterSignOffChange[];
  frozenFlights: FrozenFlight[];
  unscreenedFlights: number;
}

/** Everything the period page and `GET .../periods/{ref}` show. */
export async function getPeriodView(
  scope: Scope,
  ref: string,
  opts: { flightLimit?: number } = {},
): Promise<PeriodView> {
  const { info, row, calendar } = await resolvePeriodRef(scope, ref);
  const frozen = !!row && info.state !== 'open';
  const [figures, targets, names, snapshot, changes, frozenFlights, unscreened] = await Promise.all([
    periodFigures(scope, info, row),
    row ? listTargets(scope, [row.id]) : Promise.resolve([]),
    fleetNameMap(scope),
    frozen ? getSnapshotInfo(row.id) : Promise.resolve(null),
    frozen && row.frozenAt
      ? listChangesAfterFreeze(scope, { id: row.id, from: info.from, to: info.to, frozenAt: row.frozenAt })
      : Promise.resolve([]),
    frozen ? listFrozenFlights(row.id, { limit: opts.flightLimit ?? 200 }) : Promise.resolve([]),
    countUnscreenedFlights(scope, info),
  ]);
  const trend: TrendPoint[] = [];
  if (calendar) {
    for (const p of [...previousPeriods(calendar, 4), calendar]) {
      const r = p.ref === calendar.ref ? row : await getPeriodByKey(scope, p.ref);
      const pi = infoOf(p, r);
      const f = p.ref === calendar.ref ? figures : await periodFigures(scope, pi, r);
      const ts = r ? (p.ref === calendar.ref ? targets : await listTargets(scope, [r.id])) : [];
      trend.push({
        ref: p.ref,
        name: p.name,
        state: pi.state,
        figures: f.total,
        targets: ts
          .filter((t) => t.fleetId === null)
          .map((t) => {
            const actual = metricValue(f.total, t.metric as TargetMetric);
            return {
              metric: t.metric as TargetMetric,
              target: t.value,
              actual,
              status: targetStatus(actual === null ? null : actual / t.value),
            };
          }),
      });
    }
  }
  return {
    period: info,
    figures,
    targets: targetViews(targets, figures, names),
    trend,
    snapshot,
    changesAfterFreeze: changes,
    frozenFlights,
    unscreenedFlights: unscreened,
  };
}

// Writes.

async function ensureRow(scope: Scope, ref: string, createdBy: number | null): Promise<PeriodRow> {
  const { row, calendar } = await resolvePeriodRef(scope, ref);
  if (row) return row;
  const cal = calendar!;
  return writeTx((trx) =>
    ensurePeriodRow(
      scope,
      { kind: cal.kind, key: cal.ref, name: cal.name, from: cal.from, to: cal.to, createdBy },
      trx,
    ),
  );
}

export async function createCustomPeriod(scope: Scope, actor: PeriodActor, input: PeriodCreate): Promise<PeriodInfo> {
  const row = await writeTx(async (trx) => {
    const r = await createCustomPeriodRow(scope, { ...input, createdBy: actor.userId }, trx);
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: actor.userId,
        actor: actor.actor,
        action: 'period.created',
        target: `period:${r.key}`,
        detail: { name: input.name, from: input.from, to: input.to },
      },
      trx,
    );
    return r;
  });
  return infoOf(null, row);
}

/** Replaces a period's targets (open periods only: a frozen period keeps the targets it was frozen with). */
export async function setPeriodTargets(
  scope: Scope,
  actor: PeriodActor,
  ref: string,
  targets: { fleetId: number | null; metric: TargetMetric; value: number }[],
): Promise<void> {
  const fleets = await fleetNameMap(scope);
  const problems = targets.flatMap((t, i) =>
    t.fleetId !== null && !fleets.has(t.fleetId)
      ? [{ path: `targets.${i}.fleetId`, message: `No fleet with id ${t.fleetId} in this workspace.` }]
      : [],
  );
  if (problems.length) throw invalidFields(problems);
  const row = await ensureRow(scope, ref, actor.userId);
  await writeTx(async (trx) => {
    const fresh = await getPeriodByKey(scope, row.key, trx);
    if (!fresh || fresh.state !== 'open')
      throw conflict('This period is frozen (in review or signed): reopen it to change its targets.');
    await replaceTargets(scope, fresh.id, targets, actor.userId, trx);
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: actor.userId,
        actor: actor.actor,
        action: 'period.targets_set',
        target: `period:${fresh.key}`,
        detail: { targets },
      },
      trx,
    );
  });
}

function targetLine(t: TargetView): string {
  const fmt = (v: number) => (t.unit === 't' ? v.toFixed(2) : t.unit === '%' ? v.toFixed(1) : v.toFixed(3));
  const actual = t.actual === null ? 'no figure' : `${fmt(t.actual)} ${t.unit}`;
  const pct = t.ratio === null ? '' : ` (${Math.round(t.ratio * 100)} % of target)`;
  return `Target, ${t.fleetName}: ${t.label} at most ${fmt(t.target)} ${t.unit}; frozen figure ${actual}${pct}.`;
}

/** The period's report, drawn from the flights as they are when it is frozen (in the freezing user's units). */
async function buildPeriodReport(
  scope: Scope,
  info: PeriodInfo,
  ctx: { workspaceName: string; actorName: string; units: UnitSystem; targets: TargetView[]; frozenAt: string },
): Promise<{ summary: ReportSummary; pdf: Uint8Array; method: { method: string[]; sources: string[] } }> {
  const { period, perFleet, figures } = await reportFigures(scope, { from: info.from, to: info.to });
  const summary: ReportSummary = {
    version: 1,
    title: `${info.name} - reporting period`,
    workspaceName: ctx.workspaceName,
    period,
    fleets: perFleet.rows.map((r) => ({ id: r.fleetId ?? 0, name: r.fleetName })),
    generatedAt: ctx.frozenAt,
    generatedBy: ctx.actorName,
    units: ctx.units,
    ...figures,
  };
  const base = reportMethodText();
  const method = {
    method: [
      `Reporting period ${info.name} (${info.from} to ${info.to}): figures frozen for review on ${ctx.frozenAt.slice(0, 16).replace('T', ' ')} UTC by ${ctx.actorName}. Flights imported or screened again later are listed apart and are not in these figures.`,
      ...(ctx.targets.length ? ctx.targets.map(targetLine) : ['No targets were set for this period.']),
      ...base.method,
    ],
    sources: base.sources,
  };
  return { summary, pdf: await renderReportPdf(summary, method), method };
}

/**
 * Moves an open period to review and freezes it: its screened flights with their figures, engine
 * versions and fleets are copied, the report PDF and the audit CSV are stored with the CSV's SHA-256.
 * Refused while any flight of the period is still being screened.
 */
export async function reviewPeriod(
  scope: Scope,
  actor: PeriodActor,
  ref: string,
  ctx: { slug: string; workspaceName: string; units: UnitSystem },
): Promise<PeriodInfo> {
  const { info } = await resolvePeriodRef(scope, ref);
  if (info.state !== 'open')
    throw conflict(`This period is already ${info.state === 'signed' ? 'signed' : 'in review'}.`);
  const pending = await countUnscreenedFlights(scope, info);
  if (pending > 0)
    throw conflict(
      `${pending} flight${pending === 1 ? ' of this period is' : 's of this period are'} still being screened: wait for the import to finish, then move the period to review.`,
    );
  const row = await ensureRow(scope, ref, actor.userId);
  const view = await getPeriodView(scope, row.key, { flightLimit: 1 });
  const frozenAt = nowIso();
  const report = await buildPeriodReport(scope, info, {
    workspaceName: ctx.workspaceName,
    actorName: actor.name,
    units: ctx.units,
    targets: view.targets,
    frozenAt,
  });
  const base = appUrl();
  await writeTx(async (trx) => {
    const fresh = await getPeriodByKey(scope, row.key, trx);
    if (!fresh || fresh.state !== 'open') throw conflict('This period was moved to review meanwhile.');
    const flights = await freezeFlights(scope, fresh.id, info, trx);
    // The report was drawn just before this transaction: an import finishing in between would make
    // the PDF and the frozen flights disagree, so the freeze is refused and can simply be repeated.
    if (report.summary.totals.flights !== flights.length)
      throw conflict('Flights of this period changed while it was being frozen: move it to review again.');
    const csv = auditCsv(fresh.key, flights, (id) => flightPageUrl(base, ctx.slug, id));
    const versions = new Map<string, number>();
    for (const f of flights) versions.set(f.engineVersion, (versions.get(f.engineVersion) ?? 0) + 1);
    await insertSnapshot(
      fresh.id,
      {
        frozenAt,
        flights: flights.length,
        engineVersions: [...versions].map(([engineVersion, n]) => ({ engineVersion, flights: n })),
        assumptions: report.method,
        summaryJson: JSON.stringify(report.summary),
        targets: view.targets,
        pdf: report.pdf,
        csv,
        csvSha256: sha256Hex(csv),
      },
      trx,
    );
    if (
      !(await updatePeriodState(
        scope,
        fresh.id,
        ['open'],
        { state: 'review', frozenAt, frozenByName: actor.name },
        trx,
      ))
    )
      throw conflict('This period was moved to review meanwhile.');
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: actor.userId,
        actor: actor.actor,
        action: 'period.review',
        target: `period:${fresh.key}`,
        detail: { flights: flights.length, csvSha256: sha256Hex(csv) },
      },
      trx,
    );
  });
  return (await resolvePeriodRef(scope, row.key)).info;
}

/**
 * Signs a period in review: records the signer's name, the time and the SHA-256 of the frozen audit
 * CSV (recomputed from the stored bytes). With `hash`, refuses unless it is the hash the signer saw.
 */
export async function signPeriod(
  scope: Scope,
  actor: PeriodActor,
  ref: string,
  opts: { hash?: string } = {},
): Promise<PeriodInfo> {
  const { row, info } = await resolvePeriodRef(scope, ref);
  if (!row || info.state !== 'review')
    throw conflict(
      info.state === 'signed' ? 'This period is already signed.' : 'Move the period to review before signing it.',
    );
  await writeTx(async (trx) => {
    const files = await getSnapshotFiles(row.id, trx);
    if (!files) throw conflict('This period has no frozen figures; reopen it and move it to review again.');
    const hash = sha256Hex(files.csv);
    if (hash !== files.csvSha256)
      throw conflict('The frozen figures do not match their recorded hash; reopen the period.');
    if (opts.hash && opts.hash !== hash)
      throw conflict('The frozen figures changed since you looked at them: check the period again before signing.', [
        { path: 'hash', message: 'Not the hash of the frozen figures.' },
      ]);
    const signedAt = nowIso();
    const ok = await updatePeriodState(
      scope,
      row.id,
      ['review'],
      { state: 'signed', signedAt, signedBy: actor.userId, signedByName: actor.name, signHash: hash },
      trx,
    );
    if (!ok) throw conflict('This period changed meanwhile.');
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: actor.userId,
        actor: actor.actor,
        action: 'period.signed',
        target: `period:${row.key}`,
        detail: { sha256: hash, signedBy: actor.name, signedAt },
      },
      trx,
    );
  });
  return (await resolvePeriodRef(scope, ref)).info;
}

/** Reopens a period in review or signed: drops the frozen copy (the audit log keeps the reason and the old hash). */
export async function reopenPeriod(scope: Scope, actor: PeriodActor, ref: string, reason: string): Promise<PeriodInfo> {
  const { row, info } = await resolvePeriodRef(scope, ref);
  if (!row || info.state === 'open') throw conflict('This period is open already.');
  await writeTx(async (trx) => {
    const ok = await updatePeriodState(
      scope,
      row.id,
      ['review', 'signed'],
      {
        state: 'open',
        frozenAt: null,
        frozenByName: null,
        signedAt: null,
        signedBy: null,
        signedByName: null,
        signHash: null,
      },
      trx,
    );
    if (!ok) throw conflict('This period changed meanwhile.');
    await deleteSnapshot(row.id, trx);
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: actor.userId,
        actor: actor.actor,
        action: 'period.reopened',
        target: `period:${row.key}`,
        detail: {
          reason,
          previousState: info.state,
          frozenAt: info.frozenAt,
          signedAt: info.signedAt,
          signedBy: info.signedBy,
          sha256: info.signHash,
        },
      },
      trx,
    );
  });
  return (await resolvePeriodRef(scope, ref)).info;
}

/** The frozen report PDF of a period in review or signed. */
export async function getPeriodReportPdf(scope: Scope, ref: string): Promise<{ name: string; pdf: Buffer }> {
  const { row, info } = await resolvePeriodRef(scope, ref);
  if (!row || info.state === 'open')
    throw conflict('This period is open: its report exists once it is moved to review.');
  const files = await getSnapshotFiles(row.id);
  if (!files) throw conflict('This period has no frozen report.');
  return { name: `${info.name} report`, pdf: files.pdf };
}

/** For the audit pack: the signed period, its stored files and the changes since. */
export async function getSignedPeriodFiles(scope: Scope, ref: string) {
  const { row, info } = await resolvePeriodRef(scope, ref);
  if (!row || info.state !== 'signed')
    throw conflict('The audit pack exists for a signed period only: this one is not signed.');
  const [files, snapshot, changes] = await Promise.all([
    getSnapshotFiles(row.id),
    getSnapshotInfo(row.id),
    listChangesAfterFreeze(scope, {
      id: row.id,
      from: info.from,
      to: info.to,
      frozenAt: row.frozenAt ?? info.signedAt ?? '',
    }),
  ]);
  if (!files || !snapshot) throw conflict('This period has no frozen figures.');
  return { info, files, snapshot, changes };
}

/** The periods a page can be set to (newest first): custom ones, then each year, its quarters and months. */
export async function listPeriodOptions(
  scope: Scope,
): Promise<{ ref: string; name: string; from: string; to: string; state: PeriodState }[]> {
  const list = await listPeriods(scope);
  const pick = (p: PeriodInfo) => ({ ref: p.ref, name: p.name, from: p.from, to: p.to, state: p.state });
  const byNewest = (a: PeriodInfo, b: PeriodInfo) => b.from.localeCompare(a.from) || a.to.localeCompare(b.to);
  return [
    ...list.custom.map(pick),
    ...list.years.flatMap((y) => {
      const year = y.periods.filter((p) => p.kind === 'year');
      const quarters = y.periods.filter((p) => p.kind === 'quarter').sort(byNewest);
      const months = y.periods.filter((p) => p.kind === 'month').sort(byNewest);
      return [...year, ...quarters, ...months].map(pick);
    }),
  ];
}
