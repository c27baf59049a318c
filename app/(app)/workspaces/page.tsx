import Link from 'next/link';
import { requireUser } from '@/lib/auth/guards';
import { listWorkspacesForUser } from '@/db/workspaces';
import { getMonthSummaries } from '@/db/portfolio';
import { can, ROLE_LABELS } from '@/lib/auth/policy';
import { TopBar } from '@/components/shell/top-bar';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { formatDate, formatMass, formatNumber } from '@/lib/format';
import { monthBounds } from '@/lib/clock';
import { COUNT_LABELS } from '@/lib/counts';
import { getBillableUnits } from '@/lib/billing/usage-summary';
import { CreateWorkspaceForm } from './create-workspace-form';

export const metadata = { title: 'Workspaces' };

export default async function WorkspacesPage() {
  const user = await requireUser('/workspaces');
  const memberships = await listWorkspacesForUser({ userId: user.id });
  const [summaries, billable] = await Promise.all([
    getMonthSummaries({ workspaceIds: memberships.map((m) => m.workspace.id) }),
    Promise.all(memberships.map(async (m) => [m.workspace.id, can(m.role, 'usage:read') ? await getBillableUnits({ workspaceId: m.workspace.id }) : null] as const)).then((e) => new Map(e)),
  ]);
  const { from } = monthBounds();
  return (
    <div className="min-h-screen">
      <TopBar user={user} />
      <main id="main" className="mx-auto max-w-[1100px] px-4 py-8">
        <PageHeader title="Workspaces" lead={`Every workspace you belong to, with this month's screening figures (month from ${from}).`} />
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
                        <Link className="font-medium text-accent hover:underline" href={m.role === 'billing' ? `/w/${m.workspace.slug}/settings/billing` : `/w/${m.workspace.slug}`}>
                          {m.workspace.name}
                        </Link>
                        <div className="text-xs text-ink-faint">{m.workspace.slug}</div>
                      </td>
                      <td className="px-4 py-2.5">{ROLE_LABELS[m.role]}</td>
                      <td className="figure px-4 py-2.5 text-right" data-testid="portfolio-saved-screenings">{flights ? formatNumber(s?.savedScreenings ?? 0) : '—'}</td>
                      <td className="figure px-4 py-2.5 text-right" data-testid="portfolio-imported-flights">{flights ? formatNumber(s?.importedFlightsScreened ?? 0) : '—'}</td>
                      <td className="figure px-4 py-2.5 text-right">{flights ? formatMass(s?.noxAboveKg ?? 0, user.units) : '—'}</td>
                      <td className="figure px-4 py-2.5 text-right" data-testid="portfolio-billable-units">
                        {usage && b ? (
                          <>
                            {formatNumber(b.units)}
                            <div className="text-xs text-ink-faint">
                              {formatDate(b.periodStart)} to {formatDate(b.periodEnd)}
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
        <p className="mt-2 text-xs text-ink-faint">A dash means your role in that workspace does not include those figures.</p>
        <Card title="Create a workspace" className="mt-8 max-w-xl">
          <p className="mb-4 text-sm text-ink-soft">One workspace per operator or client. You become its owner and can invite their staff.</p>
          <CreateWorkspaceForm />
        </Card>
      </main>
    </div>
  );
}
