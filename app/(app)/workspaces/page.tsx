import Link from 'next/link';
import { requireUser } from '@/lib/auth/guards';
import { listWorkspacesForUser } from '@/db/workspaces';
import { getMonthSummaries } from '@/db/portfolio';
import { can, ROLE_LABELS } from '@/lib/auth/policy';
import { TopBar } from '@/components/shell/top-bar';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { formatMass, formatNumber } from '@/lib/format';
import { monthBounds } from '@/lib/clock';
import { CreateWorkspaceForm } from './create-workspace-form';

export const metadata = { title: 'Workspaces' };

export default async function WorkspacesPage() {
  const user = await requireUser('/workspaces');
  const memberships = await listWorkspacesForUser({ userId: user.id });
  const summaries = await getMonthSummaries({ workspaceIds: memberships.map((m) => m.workspace.id) });
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
                  <th className="px-4 py-2 text-right">Flights screened</th>
                  <th className="px-4 py-2 text-right">NOx above tropopause</th>
                  <th className="px-4 py-2 text-right">Billable units</th>
                </tr>
              </thead>
              <tbody>
                {memberships.map((m) => {
                  const s = summaries.get(m.workspace.id);
                  const flights = can(m.role, 'flights:read');
                  const usage = can(m.role, 'usage:read');
                  return (
                    <tr key={m.workspace.id} className="border-b border-line last:border-0">
                      <td className="px-4 py-2.5">
                        <Link className="font-medium text-accent hover:underline" href={m.role === 'billing' ? `/w/${m.workspace.slug}/settings/billing` : `/w/${m.workspace.slug}`}>
                          {m.workspace.name}
                        </Link>
                        <div className="text-xs text-ink-faint">{m.workspace.slug}</div>
                      </td>
                      <td className="px-4 py-2.5">{ROLE_LABELS[m.role]}</td>
                      <td className="figure px-4 py-2.5 text-right">{flights ? formatNumber(s?.flightsScreened ?? 0) : '—'}</td>
                      <td className="figure px-4 py-2.5 text-right">{flights ? formatMass(s?.noxAboveKg ?? 0, user.units) : '—'}</td>
                      <td className="figure px-4 py-2.5 text-right">{usage ? formatNumber(s?.units ?? 0) : '—'}</td>
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
