import { notFound } from 'next/navigation';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listFleets } from '@/db/fleets';
import { AppError } from '@/lib/errors';
import { formatDateTime, formatMass, formatNumber, formatPercent } from '@/lib/format';
import { getPeriodView } from '@/lib/periods/service';
import { periodRefSchema } from '@/lib/validation/periods';
import { PageHeader, Stat } from '@/components/ui/card';
import { buttonClass } from '@/components/ui/button';
import { Notice, ScreeningCaution } from '@/components/ui/notice';
import { per1000 } from '@/components/periods/period-figures';
import { PeriodFleetsCard, PeriodTrendCard } from '@/components/periods/period-figure-tables';
import { ChangesAfterSignOffCard, FrozenFlightsCard } from '@/components/periods/period-frozen-cards';
import { periodNextStepNote } from '@/components/periods/next-step';
import { PeriodSignOffCard } from '@/components/periods/period-sign-off-card';
import { PeriodTargetsCard } from '@/components/periods/period-targets-card';
import { StateBadge } from '@/components/periods/state-badge';
import { reopenPeriodAction, reviewPeriodAction, setPeriodTargetsAction, signPeriodAction } from '../actions';

export const metadata = { title: 'Reporting period' };

export default async function PeriodPage({ params }: { params: Promise<{ slug: string; period: string }> }) {
  const { slug, period: rawRef } = await params;
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
        <PeriodTargetsCard
          slug={slug}
          period={p.ref}
          targets={view.targets}
          fleets={fleets.map((f) => ({ id: f.id, name: f.name }))}
          frozen={frozen}
          canEdit={canEditTargets}
          action={setPeriodTargetsAction}
        />
        <PeriodSignOffCard
          slug={slug}
          view={view}
          can={{
            review: can(role, 'periods:review'),
            sign: can(role, 'periods:sign'),
            reopen: can(role, 'periods:reopen'),
          }}
          actions={{ review: reviewPeriodAction, sign: signPeriodAction, reopen: reopenPeriodAction }}
          nextStepNote={periodNextStepNote(p.state, role)}
        />
      </div>

      <PeriodFleetsCard fleets={view.figures.fleets} units={u} />
      <PeriodTrendCard slug={slug} current={p.ref} trend={view.trend} units={u} />

      {frozen ? <ChangesAfterSignOffCard slug={slug} changes={view.changesAfterFreeze} units={u} /> : null}
      {frozen ? <FrozenFlightsCard slug={slug} view={view} units={u} /> : null}
      <div className="mt-6">
        <ScreeningCaution />
      </div>
    </>
  );
}
