import type { ActionState } from '@/lib/errors';
import { formatPercent } from '@/lib/format';
import type { TargetView } from '@/lib/periods/service';
import { Card } from '@/components/ui/card';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { metricText, TARGET_STATUS } from './period-figures';
import { TargetsForm } from './targets-form';

interface Props {
  slug: string;
  period: string;
  targets: TargetView[];
  fleets: { id: number; name: string }[];
  frozen: boolean;
  /** The form is offered only to roles that may set targets, and only while the period is open. */
  canEdit: boolean;
  action: (slug: string, raw: unknown) => Promise<ActionState<unknown>>;
}

/** The period's figures against each of its targets, with the form to change them while it is open. */
export function PeriodTargetsCard({ slug, period, targets, fleets, frozen, canEdit, action }: Props) {
  return (
    <Card title="Against targets">
      {targets.length ? (
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
              {targets.map((x) => (
                <tr key={`${x.fleetId}:${x.metric}`} className="border-t border-line" data-testid="target-view">
                  <td className="py-1.5 pr-3">{x.fleetName}</td>
                  <td className="py-1.5 pr-3">{x.label}</td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{metricText(x.target, x.unit)}</td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{metricText(x.actual, x.unit)}</td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                    {x.ratio === null ? '–' : formatPercent(x.ratio, 0)}
                  </td>
                  <td className={`py-1.5 pl-3 ${TARGET_STATUS[x.status].className}`}>
                    {TARGET_STATUS[x.status].label}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      ) : (
        <p className="text-sm text-ink-soft">No targets for this period.</p>
      )}
      {canEdit ? (
        <div className="mt-5 border-t border-line pt-4">
          <h3 className="mb-3 text-sm font-semibold text-ink">Edit targets</h3>
          <TargetsForm
            slug={slug}
            period={period}
            fleets={fleets}
            initial={targets.map((x) => ({ fleetId: x.fleetId, metric: x.metric, target: x.target }))}
            action={action}
          />
          <p className="mt-2 text-xs text-ink-faint">
            Analysts get an e-mail once when the running figure passes 90 % and once at 100 % of a target.
          </p>
        </div>
      ) : frozen ? (
        <p className="mt-3 text-xs text-ink-faint">The targets are frozen with the figures; reopen to change them.</p>
      ) : null}
    </Card>
  );
}
