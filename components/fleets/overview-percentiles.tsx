import { fleetPercentiles } from '@/lib/fleets/percentiles';
import type { UnitSystem } from '@/db/users';
import { formatMassRange } from '@/lib/format';

/**
 * The overview's line on how sure this period's imported-flight totals are: 5-95 % from sampling
 * every flight together (an async server component; put it behind Suspense, the first sampling of a
 * large month takes seconds and is stored after).
 */
export async function OverviewPercentiles({
  workspaceId,
  from,
  to,
  units,
}: {
  workspaceId: number;
  from: string;
  to: string;
  units: UnitSystem;
}) {
  const p = await fleetPercentiles({ workspaceId }, { from, to });
  if (!p) return null;
  if ('pending' in p)
    return (
      <p className="mt-3 text-sm text-ink-soft" data-testid="overview-percentiles">
        The 5–95 % band of this period&apos;s imported flights is being prepared (the background worker is building
        their sampling data).
      </p>
    );
  const t = p.total;
  return (
    <p className="mt-3 text-sm text-ink-soft" data-testid="overview-percentiles">
      Imported flights screened in this period, 5–95 % from {p.samples} correlated samples: NOx above the tropopause{' '}
      <span className="figure text-strato-strong">
        {formatMassRange(t.noxAboveTropopauseKg.p5, t.noxAboveTropopauseKg.p95, units)}
      </span>
      , ozone-loss figure <span className="figure">{formatMassRange(t.ozoneLossKg.p5, t.ozoneLossKg.p95, units)}</span>.
      Shared inputs (EI method, residence time, J values, NOx/NOy) move every flight together; the tropopause error is
      half shared within a latitude band and month.
    </p>
  );
}
