import { requireMember } from '@/lib/auth/guards';
import { getMonthSummaries } from '@/db/portfolio';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { formatNumber } from '@/lib/format';
import { monthBounds } from '@/lib/clock';

export const metadata = { title: 'Billing' };

export default async function BillingPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace: slug } = await params;
  const { workspace } = await requireMember(slug, 'billing:read');
  const s = (await getMonthSummaries({ workspaceIds: [workspace.id] })).get(workspace.id);
  const { from, to } = monthBounds();
  return (
    <>
      <PageHeader title="Billing" lead="Usage is metered per screened flight." />
      <Card title={`This month (${from} to ${to})`}>
        <div className="grid gap-3 sm:grid-cols-2">
          <Stat label="Billable units" value={formatNumber(s?.units ?? 0)} sub="one per screened flight" />
        </div>
      </Card>
    </>
  );
}
