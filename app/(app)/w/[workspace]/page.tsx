import { requireMember } from '@/lib/auth/guards';
import { getMonthSummaries } from '@/db/portfolio';
import { PageHeader, Stat } from '@/components/ui/card';
import { ScreeningCaution } from '@/components/ui/notice';
import { ButtonLink } from '@/components/ui/button';
import { can } from '@/lib/auth/policy';
import { formatMass, formatNumber, formatPercent } from '@/lib/format';
import { monthBounds } from '@/lib/clock';

export default async function OverviewPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace: slug } = await params;
  const { workspace, role, user } = await requireMember(slug, 'flights:read');
  const s = (await getMonthSummaries({ workspaceIds: [workspace.id] })).get(workspace.id);
  const { from, to } = monthBounds();
  const share = s && s.noxTotalKg > 0 ? s.noxAboveKg / s.noxTotalKg : 0;
  return (
    <>
      <PageHeader
        title={workspace.name}
        lead={`This month (${from} to ${to}): flights screened and the NOx they put above the tropopause.`}
        actions={can(role, 'screenings:create') ? <ButtonLink href={`/w/${slug}/screen`}>Screen a flight</ButtonLink> : undefined}
      />
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Stat label="Flights screened" value={formatNumber(s?.flightsScreened ?? 0)} />
        <Stat label="NOx emitted" value={formatMass(s?.noxTotalKg ?? 0, user.units)} sub="as NO2" />
        <Stat label="NOx above tropopause" value={formatMass(s?.noxAboveKg ?? 0, user.units)} sub="as NO2" tone="strato" />
        <Stat label="Share above" value={formatPercent(share, 1)} tone="strato" />
      </div>
      <div className="mt-6">
        <ScreeningCaution />
      </div>
    </>
  );
}
