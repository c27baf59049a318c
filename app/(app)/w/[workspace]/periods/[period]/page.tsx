import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listFleets } from '@/db/fleets';
import { AppError } from '@/lib/errors';
import { formatDateTime, formatMass, formatNumber, formatPercent } from '@/lib/format';
import { getPeriodView, type PeriodFigures, type TargetStatus } from '@/lib/periods/service';
import { periodRefSchema, TARGET_METRIC_LABELS } from '@/lib/validation/periods';
import type { UnitSystem } from '@/db/users';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { buttonClass } from '@/components/ui/button';
import { Notice, ScreeningCaution } from '@/components/ui/notice';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { PeriodActions } from '@/components/periods/period-actions';
import { StateBadge } from '@/components/periods/state-badge';
import { TargetsForm } from '@/components/periods/targets-form';
import { periodNextStepNote } from '@/components/periods/next-step';
import { reopenPeriodAction, reviewPeriodAction, setPeriodTargetsAction, signPeriodAction } from '../actions';

export const metadata = { title: 'Reporting period' };

const STATUS: Record<TargetStatus, { label: string; className: string }> = {
  'on-track': { label: 'Under 90 % of target', className: 'text-tropo-strong' },
  near: { label: '90 % of target reached', className: 'text-caution font-medium' },
  over: { label: 'Target passed', className: 'text-danger font-medium' },
  'no-data': { label: 'No figure', className: 'text-ink-faint' },
};

const metricText = (v: number | null, unit: string) =>
  v === null ? '–' : `${formatNumber(v, unit === 't' ? 2 : unit === '%' ? 1 : 3)} ${unit}`;
const per1000 = (f: PeriodFigures, u: UnitSystem) =>
  f.noxAbovePer1000KmKg === null ? '–' : `${formatMass(f.noxAbovePer1000KmKg, u)} per 1000 km`;

export default async function PeriodPage({ params }: { params: Promise<{ workspace: string; period: string }> }) {
  const { workspace: slug, period: rawRef } = await params;
  const { workspace, role, user } = await requireMember(slug, 'flights:read');
  const ref = periodRefSchema.safeParse(decodeURIComponent(rawRef));
  if (!ref.success) notFound();
  const scope = { workspaceId: workspace.id };
  const [view, fleets] = await Promise.all([
    getPeriodView(scope, ref.data).catch((err: unknown) => {
      if (err instanceof AppError && err.code === 'not_found') notFound();
      throw err;
    }),
    listFleets(scope),
  ]);
  const p = view.period;
  const u = user.units;
  const t = view.figures.total;
  const api = `/api/v1/workspaces/${slug}/periods/${p.ref}`;
  const frozen = p.state !== 'open';
  const canEditTargets = can(role, 'targets:write') && !frozen;

  return (
    <>
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            {p.name} <StateBadge state={p.state} />
          </span>
        }
        lead={`${p.from} to ${p.to}. ${frozen ? `Figures frozen on ${formatDateTime(p.frozenAt)} by ${p.frozenBy}.` : 'Running figures over the flights screened so far.'}`}
        actions={
          <>
            {frozen ? (
              <a href={`${api}/report`} download className={buttonClass('secondary')}>
                Report PDF
              </a>
            ) : null}
            {p.state === 'signed' ? (
              <a href={`${api}/audit-pack`} download className={buttonClass('primary')} data-testid="audit-pack">
                Download the audit pack
              </a>
            ) : null}
          </>
        }
      />
      {view.unscreenedFlights > 0 && !frozen ? (
        <div className="mb-4">
          <Notice tone="caution">
            {formatNumber(view.unscreenedFlights)} flights of this period are still being screened; it can move to
            review once they are done.
          </Notice>
        </div>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Stat
          label="Flights"
          value={<span data-testid="period-flights">{formatNumber(t.flights)}</span>}
          sub={view.figures.source === 'frozen' ? 'frozen' : 'running'}
        />
        <Stat label="NOx above tropopause" value={formatMass(t.noxAboveKg, u)} sub="as NO2" tone="strato" />
        <Stat label="Share above" value={t.shareAbove === null ? '–' : formatPercent(t.shareAbove, 1)} tone="strato" />
        <Stat label="NOx above per 1000 km" value={per1000(t, u)} />
      </div>

      <div className="mt-6 grid grid-cols-1 gap-6 *:min-w-0 lg:grid-cols-2">
        <Card title="Against targets">
          {view.targets.length ? (
            <ScrollRegion label="Figures against targets">
              <table className="w-full text-sm">
                <caption className="sr-only">Each target with the period&apos;s figure</caption>
                <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                  <tr>
                    <th className="py-2 pr-3">Fleet</th>
                    <th className="py-2 pr-3">Measure</th>
                    <th className="py-2 pl-3 text-right">Target</th>
                    <th className="py-2 pl-3 text-right">Figure</th>
                    <th className="py-2 pl-3 text-right">Of target</th>
                    <th className="py-2 pl-3">Status</th>
                  </tr>
                </thead>
                <tbody>
                  {view.targets.map((x) => (
                    <tr key={`${x.fleetId}:${x.metric}`} className="border-t border-line" data-testid="target-view">
                      <td className="py-1.5 pr-3">{x.fleetName}</td>
                      <td className="py-1.5 pr-3">{x.label}</td>
                      <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                        {metricText(x.target, x.unit)}
                      </td>
                      <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                        {metricText(x.actual, x.unit)}
                      </td>
                      <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                        {x.ratio === null ? '–' : formatPercent(x.ratio, 0)}
                      </td>
                      <td className={`py-1.5 pl-3 ${STATUS[x.status].className}`}>{STATUS[x.status].label}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollRegion>
          ) : (
            <p className="text-sm text-ink-soft">No targets for this period.</p>
          )}
          {canEditTargets ? (
            <div className="mt-5 border-t border-line pt-4">
              <h3 className="mb-3 text-sm font-semibold text-ink">Edit targets</h3>
              <TargetsForm
                slug={slug}
                period={p.ref}
                fleets={fleets.map((f) => ({ id: f.id, name: f.name }))}
                initial={view.targets.map((x) => ({ fleetId: x.fleetId, metric: x.metric, target: x.target }))}
                action={setPeriodTargetsAction}
              />
              <p className="mt-2 text-xs text-ink-faint">
                Analysts get an e-mail once when the running figure passes 90 % and once at 100 % of a target.
              </p>
            </div>
          ) : frozen ? (
            <p className="mt-3 text-xs text-ink-faint">
              The targets are frozen with the figures; reopen to change them.
            </p>
          ) : null}
        </Card>

        <Card title="Review and sign-off">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-ink-soft">State</dt>
            <dd>
              <StateBadge state={p.state} />
            </dd>
            <dt className="text-ink-soft">Frozen</dt>
            <dd>{p.frozenAt ? `${formatDateTime(p.frozenAt)} by ${p.frozenBy}` : '–'}</dd>
            <dt className="text-ink-soft">Signed</dt>
            <dd data-testid="signed-by">{p.signedAt ? `${formatDateTime(p.signedAt)} by ${p.signedBy}` : '–'}</dd>
            <dt className="text-ink-soft">SHA-256</dt>
            <dd className="break-all font-mono text-xs" data-testid="sign-hash">
              {p.signHash ?? view.snapshot?.csvSha256 ?? '–'}
            </dd>
          </dl>
          {view.snapshot ? (
            <p className="mt-2 text-xs text-ink-faint">
              The hash of the audit CSV of the {formatNumber(view.snapshot.flights)} frozen flights (engine{' '}
              {view.snapshot.engineVersions.map((v) => v.engineVersion).join(', ') || '–'}); it recomputes from
              flights.csv in the audit pack.
            </p>
          ) : null}
          <div className="mt-4">
            <PeriodActions
              slug={slug}
              period={p.ref}
              state={p.state}
              hash={view.snapshot?.csvSha256 ?? null}
              can={{
                review: can(role, 'periods:review'),
                sign: can(role, 'periods:sign'),
                reopen: can(role, 'periods:reopen'),
              }}
              actions={{ review: reviewPeriodAction, sign: signPeriodAction, reopen: reopenPeriodAction }}
            />
            {periodNextStepNote(p.state, role) ? (
              <p className="text-sm text-ink-soft" data-testid="period-next-step">
                {periodNextStepNote(p.state, role)}
              </p>
            ) : null}
          </div>
        </Card>
      </div>

      {view.figures.fleets.length ? (
        <Card title="By fleet" className="mt-6">
          <ScrollRegion label="Figures by fleet">
            <table className="w-full text-sm">
              <caption className="sr-only">The period&apos;s figures per fleet</caption>
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th className="py-2 pr-3">Fleet</th>
                  <th className="py-2 pl-3 text-right">Flights</th>
                  <th className="py-2 pl-3 text-right">NOx above tropopause</th>
                  <th className="py-2 pl-3 text-right">Share above</th>
                  <th className="py-2 pl-3 text-right">Per 1000 km</th>
                </tr>
              </thead>
              <tbody>
                {view.figures.fleets.map((f) => (
                  <tr key={f.fleetId ?? 'none'} className="border-t border-line">
                    <td className="py-1.5 pr-3">{f.fleetName}</td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{formatNumber(f.flights)}</td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{formatMass(f.noxAboveKg, u)}</td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                      {f.shareAbove === null ? '–' : formatPercent(f.shareAbove, 1)}
                    </td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{per1000(f, u)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </Card>
      ) : null}

      {view.trend.length ? (
        <Card title="Trend over past periods" className="mt-6">
          <ScrollRegion label="Trend over past periods">
            <table className="w-full text-sm">
              <caption className="sr-only">
                This period and the four before it, against their workspace-wide targets
              </caption>
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th className="py-2 pr-3">Period</th>
                  <th className="py-2 pr-3">State</th>
                  <th className="py-2 pl-3 text-right">Flights</th>
                  <th className="py-2 pl-3 text-right">NOx above tropopause</th>
                  <th className="py-2 pl-3 text-right">Share above</th>
                  <th className="py-2 pl-3 text-right">Per 1000 km</th>
                  <th className="py-2 pl-3">Against workspace targets</th>
                </tr>
              </thead>
              <tbody>
                {view.trend.map((r) => (
                  <tr key={r.ref} className={`border-t border-line ${r.ref === p.ref ? 'font-medium' : ''}`}>
                    <td className="py-1.5 pr-3 whitespace-nowrap">
                      <Link
                        href={`/w/${slug}/periods/${r.ref}`}
                        className="text-accent underline-offset-2 hover:underline"
                      >
                        {r.name}
                      </Link>
                    </td>
                    <td className="py-1.5 pr-3">
                      <StateBadge state={r.state} />
                    </td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                      {formatNumber(r.figures.flights)}
                    </td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                      {formatMass(r.figures.noxAboveKg, u)}
                    </td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                      {r.figures.shareAbove === null ? '–' : formatPercent(r.figures.shareAbove, 1)}
                    </td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{per1000(r.figures, u)}</td>
                    <td className="py-1.5 pl-3 text-xs">
                      {r.targets.length
                        ? r.targets
                            .map(
                              (x) =>
                                `${TARGET_METRIC_LABELS[x.metric].label}: ${metricText(x.actual, TARGET_METRIC_LABELS[x.metric].unit)} of ${metricText(x.target, TARGET_METRIC_LABELS[x.metric].unit)} (${STATUS[x.status].label.toLowerCase()})`,
                            )
                            .join('; ')
                        : '–'}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </Card>
      ) : null}

      {frozen ? (
        <Card title={`After sign-off (${view.changesAfterFreeze.length})`} className="mt-6">
          {view.changesAfterFreeze.length ? (
            <>
              <p className="mb-3 text-sm text-ink-soft">
                Flights dated in this period that were imported, screened again or removed after it was frozen. They are
                not in its figures until the period is reopened and moved to review again.
              </p>
              <ScrollRegion label="Changes after sign-off">
                <table className="w-full text-sm" data-testid="after-sign-off">
                  <caption className="sr-only">Changes after the period was frozen</caption>
                  <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                    <tr>
                      <th className="py-2 pr-3">Change</th>
                      <th className="py-2 pr-3">Date</th>
                      <th className="py-2 pr-3">Flight</th>
                      <th className="py-2 pr-3">Route</th>
                      <th className="py-2 pl-3 text-right">NOx above now</th>
                      <th className="py-2 pl-3 text-right">Frozen</th>
                    </tr>
                  </thead>
                  <tbody>
                    {view.changesAfterFreeze.map((c) => (
                      <tr key={`${c.kind}:${c.flightId}`} className="border-t border-line">
                        <td className="py-1.5 pr-3">
                          {c.kind === 'added' ? 'Imported' : c.kind === 'rescreened' ? 'Screened again' : 'Removed'}
                        </td>
                        <td className="figure py-1.5 pr-3">{c.date}</td>
                        <td className="py-1.5 pr-3">
                          {c.kind === 'removed' ? (
                            c.flight
                          ) : (
                            <Link
                              prefetch={false}
                              href={`/w/${slug}/flights/${c.flightId}`}
                              className="text-accent underline-offset-2 hover:underline"
                            >
                              {c.flight}
                            </Link>
                          )}
                        </td>
                        <td className="py-1.5 pr-3">
                          {c.origin}–{c.destination}
                        </td>
                        <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                          {c.noxAboveKgNow === null ? '–' : formatMass(c.noxAboveKgNow, u)}
                        </td>
                        <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                          {c.noxAboveKgFrozen === null ? '–' : formatMass(c.noxAboveKgFrozen, u)}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </ScrollRegion>
            </>
          ) : (
            <p className="text-sm text-ink-soft">Nothing has changed since the figures were frozen.</p>
          )}
        </Card>
      ) : null}

      {frozen ? (
        <Card title={`Frozen flights (${formatNumber(view.snapshot?.flights ?? 0)})`} className="mt-6">
          <ScrollRegion label="Frozen flights">
            <table className="w-full text-sm">
              <caption className="sr-only">The flights in the frozen figures</caption>
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th className="py-2 pr-3">Date</th>
                  <th className="py-2 pr-3">Flight</th>
                  <th className="py-2 pr-3">Route</th>
                  <th className="py-2 pr-3">Aircraft</th>
                  <th className="py-2 pr-3">Fleet</th>
                  <th className="py-2 pl-3 text-right">NOx above tropopause</th>
                  <th className="py-2 pl-3">Engine</th>
                  <th className="py-2 pl-3 text-right">Import</th>
                </tr>
              </thead>
              <tbody>
                {view.frozenFlights.map((f) => (
                  <tr key={f.flightId} className="border-t border-line">
                    <td className="figure py-1.5 pr-3">{f.date}</td>
                    <td className="py-1.5 pr-3">
                      <Link
                        prefetch={false}
                        href={`/w/${slug}/flights/${f.flightId}`}
                        className="text-accent underline-offset-2 hover:underline"
                      >
                        {f.flight}
                      </Link>
                    </td>
                    <td className="py-1.5 pr-3">
                      {f.origin}–{f.destination}
                    </td>
                    <td className="py-1.5 pr-3">{f.aircraftCode}</td>
                    <td className="py-1.5 pr-3">{f.fleetName ?? 'No fleet'}</td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{formatMass(f.noxAboveKg, u)}</td>
                    <td className="py-1.5 pl-3 text-xs">{f.engineVersion}</td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{f.importId ?? '–'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
          {(view.snapshot?.flights ?? 0) > view.frozenFlights.length ? (
            <p className="mt-2 text-xs text-ink-faint">
              The first {formatNumber(view.frozenFlights.length)} shown; every flight is in the audit CSV.
            </p>
          ) : null}
        </Card>
      ) : null}
      <div className="mt-6">
        <ScreeningCaution />
      </div>
    </>
  );
}
