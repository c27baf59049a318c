import Link from 'next/link';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { formatDateTime } from '@/lib/format';
import { PERIOD_STATE_LABELS } from '@/lib/periods/calendar';
import { listPeriods, type PeriodInfo } from '@/lib/periods/service';
import { Card, PageHeader } from '@/components/ui/card';
import { ScreeningCaution } from '@/components/ui/notice';
import { CustomPeriodForm } from '@/components/periods/custom-period-form';
import { StateBadge } from '@/components/periods/state-badge';
import { createPeriodAction } from './actions';
import { TableHead } from '@/components/ui/table-head';

export const metadata = { title: 'Periods & sign-off' };

function PeriodRows({ slug, periods }: { slug: string; periods: PeriodInfo[] }) {
  return (
    <tbody>
      {periods.map((p) => (
        <tr key={p.ref} className="border-b border-line align-top">
          <td className="px-2 py-1.5">
            <Link
              href={`/w/${slug}/periods/${p.ref}`}
              className="font-medium text-accent underline-offset-2 hover:underline"
            >
              {p.name}
            </Link>
          </td>
          <td className="figure px-2 py-1.5 text-ink-soft">
            <span className="whitespace-nowrap">{p.from}</span> to <span className="whitespace-nowrap">{p.to}</span>
          </td>
          <td className="px-2 py-1.5">
            <StateBadge state={p.state} />
          </td>
          <td className="px-2 py-1.5 text-ink-soft">
            {p.state === 'signed'
              ? `${p.signedBy} on ${formatDateTime(p.signedAt)}`
              : p.state === 'review'
                ? `Frozen by ${p.frozenBy}`
                : ''}
          </td>
        </tr>
      ))}
    </tbody>
  );
}

function Head() {
  return (
    <TableHead
      className="border-b border-line-strong text-left text-xs uppercase tracking-wide text-ink-soft"
      pad="px-2 py-2"
      gap=""
      cellClassName="font-medium"
      columns={['Period', 'Dates', 'State', 'Sign-off']}
    />
  );
}

export default async function PeriodsPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace, role } = await requireMember(slug, 'flights:read');
  const list = await listPeriods({ workspaceId: workspace.id });
  return (
    <>
      <PageHeader
        title="Periods & sign-off"
        lead={`Report a month, a quarter or a year against its targets. An analyst moves a period to review, which freezes its figures; an owner signs it. States: ${Object.values(PERIOD_STATE_LABELS).join(', ')}.`}
      />
      <Card title={`Custom periods (${list.custom.length})`} className="mb-6">
        {list.custom.length ? (
          <div className="overflow-x-auto">
            <table className="w-full text-sm">
              <Head />
              <PeriodRows slug={slug} periods={list.custom} />
            </table>
          </div>
        ) : (
          <p className="text-sm text-ink-soft">
            None yet.{' '}
            {can(role, 'periods:define') ? 'Define one below, e.g. a financial year.' : 'An owner can define them.'}
          </p>
        )}
        {can(role, 'periods:define') ? (
          <div className="mt-5 border-t border-line pt-4">
            <h3 className="mb-3 text-sm font-semibold text-ink">New custom period</h3>
            <CustomPeriodForm slug={slug} action={createPeriodAction} />
          </div>
        ) : null}
      </Card>
      {list.years.map((y) => (
        <Card key={y.year} title={String(y.year)} className="mb-6">
          <div className="overflow-x-auto">
            <table className="w-full text-sm">
              <caption className="sr-only">Year, quarters of {y.year}</caption>
              <Head />
              <PeriodRows slug={slug} periods={y.periods.filter((p) => p.kind !== 'month')} />
            </table>
          </div>
          <details className="mt-3">
            <summary className="cursor-pointer text-sm text-accent">Months of {y.year}</summary>
            <div className="mt-2 overflow-x-auto">
              <table className="w-full text-sm">
                <caption className="sr-only">Months of {y.year}</caption>
                <Head />
                <PeriodRows slug={slug} periods={y.periods.filter((p) => p.kind === 'month')} />
              </table>
            </div>
          </details>
        </Card>
      ))}
      <ScreeningCaution />
    </>
  );
}
