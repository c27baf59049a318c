import { ScrollRegion } from '@/components/ui/scroll-region';
import Link from 'next/link';
import { requireUser } from '@/lib/auth/guards';
import { listWorkspacesForUser } from '@/db/workspaces';
import { getClientStatuses, getMonthSummaries, type ClientStatus } from '@/db/portfolio';
import { getBilling, type BillingDto } from '@/db/billing';
import { CopyLibraryForm } from './copy-library-form';
import type { UnitSystem } from '@/db/users';
import { can, ROLE_LABELS } from '@/lib/auth/policy';
import { TopBar } from '@/components/shell/top-bar';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { formatDate, formatMassIn, formatMonth, formatNumber, formatPercent, massColumnUnit } from '@/lib/format';
import { monthBounds } from '@/lib/clock';
import { COUNT_LABELS } from '@/lib/counts';
import { getBillableUnits } from '@/lib/billing/usage-summary';
import { CreateWorkspaceForm } from './create-workspace-form';

export const metadata = { title: 'Workspaces' };

export default async function WorkspacesPage() {
  const user = await requireUser('/workspaces');
  const memberships = await listWorkspacesForUser({ userId: user.id });
  const readable = memberships.filter((m) => can(m.role, 'flights:read')).map((m) => m.workspace.id);
  const [summaries, billable, statuses, billing] = await Promise.all([
    getMonthSummaries({ workspaceIds: memberships.map((m) => m.workspace.id) }),
    Promise.all(
      memberships.map(
        async (m) =>
          [
            m.workspace.id,
            can(m.role, 'usage:read') ? await getBillableUnits({ workspaceId: m.workspace.id }) : null,
          ] as const,
      ),
    ).then((e) => new Map(e)),
    getClientStatuses({ workspaceIds: readable }),
    Promise.all(
      memberships.map(
        async (m) =>
          [
            m.workspace.id,
            can(m.role, 'billing:read') ? await getBilling({ workspaceId: m.workspace.id }) : null,
          ] as const,
      ),
    ).then((e) => new Map(e)),
  ]);
  const owned = memberships
    .filter((m) => can(m.role, 'library:copy'))
    .map((m) => ({ slug: m.workspace.slug, name: m.workspace.name }));
  const { from } = monthBounds();
  // The portfolio's NOx column shows every workspace in one unit, the one its largest figure needs.
  const portfolioAboveUnit = massColumnUnit(
    readable.map((id) => summaries.get(id)?.noxAboveKg ?? 0),
    user.units,
  );
  return (
    <div className="min-h-screen">
      <TopBar user={user} />
      <main id="main" className="mx-auto max-w-[1100px] px-4 py-8">
        <PageHeader
          title="Workspaces"
          lead={`Every workspace you belong to, with this month's screening figures (month from ${from}).`}
        />
        {memberships.length === 0 ? (
          <EmptyState title="You are not in any workspace yet">
            Create one below for your operator or a client, or ask a workspace owner to invite you.
          </EmptyState>
        ) : (
          <div className="overflow-x-auto rounded-card border border-line bg-paper-raised">
            <table className="w-full text-sm">
              <thead className="border-b border-line bg-paper-sunk text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th className="px-4 py-2">Workspace</th>
                  <th className="px-4 py-2">Your role</th>
                  <th className="px-4 py-2 text-right">
                    {COUNT_LABELS.savedScreenings}
                    <div className="font-normal normal-case">saved this month</div>
                  </th>
                  <th className="px-4 py-2 text-right">
                    {COUNT_LABELS.importedFlightsScreened}
                    <div className="font-normal normal-case">flown this month</div>
                  </th>
                  <th className="px-4 py-2 text-right">
                    NOx above tropopause
                    <div className="font-normal normal-case">of both, this month</div>
                  </th>
                  <th className="px-4 py-2 text-right">
                    {COUNT_LABELS.billableUnits}
                    <div className="font-normal normal-case">this billing period</div>
                  </th>
                </tr>
              </thead>
              <tbody>
                {memberships.map((m) => {
                  const s = summaries.get(m.workspace.id);
                  const flights = can(m.role, 'flights:read');
                  const usage = can(m.role, 'usage:read');
                  const b = billable.get(m.workspace.id);
                  return (
                    <tr key={m.workspace.id} className="border-b border-line last:border-0">
                      <td className="px-4 py-2.5">
                        <Link
                          className="font-medium text-accent hover:underline"
                          href={
                            m.role === 'billing' ? `/w/${m.workspace.slug}/settings/billing` : `/w/${m.workspace.slug}`
                          }
                        >
                          {m.workspace.name}
                        </Link>
                        <div className="text-xs text-ink-faint">{m.workspace.slug}</div>
                      </td>
                      <td className="px-4 py-2.5">{ROLE_LABELS[m.role]}</td>
                      <td className="figure px-4 py-2.5 text-right" data-testid="portfolio-saved-screenings">
                        {flights ? formatNumber(s?.savedScreenings ?? 0) : '—'}
                      </td>
                      <td className="figure px-4 py-2.5 text-right" data-testid="portfolio-imported-flights">
                        {flights ? formatNumber(s?.importedFlightsScreened ?? 0) : '—'}
                      </td>
                      <td className="figure px-4 py-2.5 text-right">
                        {flights ? formatMassIn(s?.noxAboveKg ?? 0, portfolioAboveUnit) : '—'}
                      </td>
                      <td className="figure px-4 py-2.5 text-right" data-testid="portfolio-billable-units">
                        {usage && b ? (
                          <>
                            <span data-testid="portfolio-billable-units-count">{formatNumber(b.units)}</span>
                            <div className="text-xs text-ink-faint">
                              <span className="whitespace-nowrap">{formatDate(b.periodStart)}</span> to{' '}
                              <span className="whitespace-nowrap">{formatDate(b.periodEnd)}</span>
                            </div>
                          </>
                        ) : (
                          '—'
                        )}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
        <p className="mt-2 text-xs text-ink-faint">
          A dash means your role in that workspace does not include those figures.
        </p>
        {memberships.some((m) => statuses.has(m.workspace.id) || billing.get(m.workspace.id)) ? (
          <section className="mt-8" aria-labelledby="clients-heading">
            <h2 id="clients-heading" className="mb-3 text-lg font-semibold text-ink">
              Clients at a glance
            </h2>
            <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
              {memberships.map((m) => (
                <ClientCard
                  key={m.workspace.id}
                  name={m.workspace.name}
                  slug={m.workspace.slug}
                  status={statuses.get(m.workspace.id) ?? null}
                  billing={billing.get(m.workspace.id) ?? null}
                  units={user.units}
                />
              ))}
            </div>
          </section>
        ) : null}
        {owned.length >= 2 ? (
          <Card title="Copy an engine and aircraft-type library" className="mt-8 max-w-2xl">
            <p className="mb-4 text-sm text-ink-soft">
              Clients often fly the same engines: copy engines, aircraft types and fleet definitions from one workspace
              you own to another.
            </p>
            <CopyLibraryForm workspaces={owned} />
          </Card>
        ) : null}
        <Card title="Create a workspace" className="mt-8 max-w-xl">
          <p className="mb-4 text-sm text-ink-soft">
            One workspace per operator or client. You become its owner and can invite their staff.
          </p>
          <CreateWorkspaceForm />
        </Card>
      </main>
    </div>
  );
}

const BILLING_LABEL: Record<BillingDto['status'], string> = {
  trialing: 'Trial',
  active: 'Active',
  past_due: 'Past due',
  canceled: 'Canceled',
};

function billingText(b: BillingDto): string {
  if (b.status === 'trialing' && b.trialEndsAt) return `Trial, ends ${formatDate(b.trialEndsAt)}`;
  return BILLING_LABEL[b.status];
}

/** One client: trend of NOx above the tropopause and its share, billing state, imports and the last report sent. */
function ClientCard({
  name,
  slug,
  status,
  billing,
  units,
}: {
  name: string;
  slug: string;
  status: ClientStatus | null;
  billing: BillingDto | null;
  units: UnitSystem;
}) {
  if (!status && !billing) return null;
  // The trend row shows every month in one unit, the one its largest month needs.
  const aboveUnit = massColumnUnit(status?.trend.map((t) => t.noxAboveKg) ?? [], units);
  return (
    <div className="rounded-card border border-line bg-paper-raised p-4" data-testid={`client-${slug}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="font-semibold text-ink">{name}</h3>
        {billing ? (
          <span
            data-testid="client-billing"
            className={`rounded-full border px-2 py-0.5 text-xs ${billing.status === 'past_due' || billing.status === 'canceled' ? 'border-danger/40 bg-danger-soft text-danger' : 'border-line-strong bg-paper-sunk text-ink-soft'}`}
          >
            {billingText(billing)}
          </span>
        ) : null}
      </div>
      {status ? (
        <>
          <ScrollRegion label={`Trend of ${name}`} className="mt-3">
            <table className="w-full text-xs" data-testid="client-trend">
              <caption className="sr-only">NOx above the tropopause and its share, last six months, {name}</caption>
              <thead className="text-left text-ink-soft">
                <tr>
                  <th scope="col" className="py-1 pr-2 font-medium">
                    Month (flight date)
                  </th>
                  {status.trend.map((t) => (
                    <th key={t.month} scope="col" className="py-1 px-1 text-right font-medium whitespace-nowrap">
                      {formatMonth(t.month)}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody className="figure">
                <tr className="border-t border-line">
                  <th scope="row" className="py-1 pr-2 text-left font-normal text-ink-soft">
                    NOx above tropopause
                  </th>
                  {status.trend.map((t) => (
                    <td key={t.month} className="py-1 px-1 text-right whitespace-nowrap">
                      {formatMassIn(t.noxAboveKg, aboveUnit)}
                    </td>
                  ))}
                </tr>
                <tr className="border-t border-line">
                  <th scope="row" className="py-1 pr-2 text-left font-normal text-ink-soft">
                    Share above
                  </th>
                  {status.trend.map((t) => (
                    <td key={t.month} className="py-1 px-1 text-right">
                      {t.shareAbove === null ? '–' : formatPercent(t.shareAbove, 0)}
                    </td>
                  ))}
                </tr>
              </tbody>
            </table>
          </ScrollRegion>
          <ul className="mt-3 space-y-1 text-sm">
            <li data-testid="client-imports">
              Imports:{' '}
              {status.imports.running || status.imports.failed ? (
                <Link className="text-accent underline" href={`/w/${slug}/imports`}>
                  {[
                    status.imports.running ? `${status.imports.running} running` : null,
                    status.imports.failed ? `${status.imports.failed} failed` : null,
                  ]
                    .filter(Boolean)
                    .join(', ')}
                </Link>
              ) : (
                <span className="text-ink-soft">none running or failed</span>
              )}
            </li>
            <li data-testid="client-last-report">
              Last report sent:{' '}
              {status.lastReportSent ? (
                <Link className="text-accent underline" href={`/w/${slug}/reports/${status.lastReportSent.reportId}`}>
                  {status.lastReportSent.reportName}, {formatDate(status.lastReportSent.at)} to{' '}
                  {status.lastReportSent.recipients} recipient{status.lastReportSent.recipients === 1 ? '' : 's'}
                </Link>
              ) : (
                <span className="text-ink-soft">none yet</span>
              )}
            </li>
          </ul>
        </>
      ) : null}
    </div>
  );
}
