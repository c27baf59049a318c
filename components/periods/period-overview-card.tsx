import Link from 'next/link';
import type { UnitSystem } from '@/db/users';
import { formatMass, formatNumber, formatPercent } from '@/lib/format';
import { getPeriodView, listPeriodOptions } from '@/lib/periods/service';
import { periodRefSchema } from '@/lib/validation/periods';
import { Card } from '@/components/ui/card';
import { PeriodSelect } from './period-select';
import { StateBadge } from './state-badge';

/** The overview set to a reporting period: its figures (frozen or running) against its targets. */
export async function PeriodOverviewCard({
  slug,
  workspaceId,
  period,
  units,
}: {
  slug: string;
  workspaceId: number;
  period: string | undefined;
  units: UnitSystem;
}) {
  const scope = { workspaceId };
  const ref = periodRefSchema.safeParse(period ?? '');
  const [options, view] = await Promise.all([
    listPeriodOptions(scope),
    ref.success ? getPeriodView(scope, ref.data, { flightLimit: 1 }).catch(() => null) : Promise.resolve(null),
  ]);
  const chosen = view?.period.ref ?? '';
  return (
    <Card title="Reporting period" className="mt-6">
      <div className="mb-3">
        <PeriodSelect
          id="overview-period"
          label="Set the overview to a period"
          options={options}
          value={chosen}
          hrefFor={{ path: `/w/${slug}`, mode: 'ref' }}
        />
      </div>
      {view ? (
        <div className="space-y-3 text-sm">
          <p className="flex flex-wrap items-center gap-2">
            <Link
              href={`/w/${slug}/periods/${view.period.ref}`}
              className="font-medium text-accent underline underline-offset-2"
            >
              {view.period.name}
            </Link>
            <StateBadge state={view.period.state} />
            <span className="text-ink-soft">
              {view.period.from} to {view.period.to} · {formatNumber(view.figures.total.flights)} flights ·{' '}
              {formatMass(view.figures.total.noxAboveKg, units)} NOx above the tropopause ·{' '}
              {view.figures.total.shareAbove === null ? '–' : formatPercent(view.figures.total.shareAbove, 1)} above (
              {view.figures.source})
            </span>
          </p>
          {view.targets.length ? (
            <ul className="space-y-1" data-testid="overview-targets">
              {view.targets.map((t) => (
                <li key={`${t.fleetId}:${t.metric}`}>
                  {t.fleetName}, {t.label}:{' '}
                  <span className="figure">
                    {t.actual === null ? '–' : formatNumber(t.actual, t.unit === 't' ? 2 : 1)} {t.unit}
                  </span>{' '}
                  of a target of{' '}
                  <span className="figure">
                    {formatNumber(t.target, t.unit === 't' ? 2 : 1)} {t.unit}
                  </span>
                  {t.ratio === null ? '' : ` (${formatPercent(t.ratio, 0)})`}
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-ink-soft">No targets for this period.</p>
          )}
        </div>
      ) : (
        <p className="text-sm text-ink-soft">
          Choose a month, quarter or year to see its figures against its targets, or open{' '}
          <Link href={`/w/${slug}/periods`} className="text-accent underline underline-offset-2">
            Periods &amp; sign-off
          </Link>
          .
        </p>
      )}
    </Card>
  );
}
