import Link from 'next/link';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listFleets } from '@/db/fleets';
import { listReports } from '@/db/reports';
import { resolvePeriod } from '@/lib/fleets/compare';
import { isCalendarDate } from '@/lib/validation/fleets';
import { formatDateTime } from '@/lib/format';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { ScreeningCaution } from '@/components/ui/notice';
import { ReportBuilder } from '@/components/reports/report-builder';
import { createReportAction } from './actions';
import { TableHead } from '@/components/ui/table-head';

export const metadata = { title: 'Reports' };

type SearchParams = Record<string, string | string[] | undefined>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) ?? '';

function defaultPeriod(sp: SearchParams): { from: string; to: string } {
  const from = one(sp.from);
  const to = one(sp.to);
  if (isCalendarDate(from) && isCalendarDate(to) && from <= to) return { from, to };
  const p = resolvePeriod({});
  return { from: p.from, to: p.to };
}

const kb = (bytes: number) => `${Math.max(1, Math.round(bytes / 1024))} kB`;

export default async function ReportsPage({
  params,
  searchParams,
}: {
  params: Promise<{ slug: string }>;
  searchParams: Promise<SearchParams>;
}) {
  const { slug } = await params;
  const { workspace, role } = await requireMember(slug, 'flights:read');
  const sp = await searchParams;
  const scope = { workspaceId: workspace.id };
  const [fleets, reports] = await Promise.all([listFleets(scope), listReports(scope, { limit: 100 })]);
  const canCreate = can(role, 'reports:create');
  const asked = new Set(
    one(sp.fleets)
      .split(',')
      .map(Number)
      .filter((n) => Number.isInteger(n) && n > 0),
  );
  const known = fleets.filter((f) => asked.has(f.id)).map((f) => f.id);
  const defaults = {
    ...defaultPeriod(sp),
    fleetIds: known.length ? known : fleets.filter((f) => f.screenedFlights > 0).map((f) => f.id),
  };
  const base = `/api/v1/workspaces/${slug}/reports`;

  return (
    <>
      <PageHeader
        title="Reports"
        lead="Fleet reports for a period: a PDF with tables, monthly charts, method, assumptions and cautions, and a CSV of the figures. Stored here, downloadable and sent by e-mail."
      />
      {canCreate ? (
        <Card title="Build a fleet report" className="mb-6">
          {fleets.length === 0 ? (
            <EmptyState
              title="No fleets to report on"
              action={
                <ButtonLink href={`/w/${slug}/fleets`} variant="secondary">
                  Set up fleets
                </ButtonLink>
              }
            >
              Create a fleet and give your aircraft types a default fleet first.
            </EmptyState>
          ) : (
            <ReportBuilder
              slug={slug}
              fleets={fleets.map((f) => ({ id: f.id, name: f.name, screenedFlights: f.screenedFlights }))}
              defaults={defaults}
              action={createReportAction}
            />
          )}
        </Card>
      ) : null}
      <Card title={`Stored reports (${reports.items.length})`}>
        {reports.items.length === 0 ? (
          <EmptyState title="No reports yet">
            {canCreate
              ? 'Choose a period and fleets above and build the first one.'
              : 'An analyst or the owner can build fleet reports; they will be listed here.'}
          </EmptyState>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full min-w-[720px] text-sm">
              <TableHead
                className="border-b border-line-strong text-left text-xs uppercase tracking-wide text-ink-soft"
                pad="px-2 py-2"
                gap=""
                cellClassName="font-medium"
                columns={['Report', 'Period', 'Fleets', 'Built', 'E-mailed', 'Download']}
              />
              <tbody>
                {reports.items.map((r) => (
                  <tr key={r.id} className="border-b border-line align-top">
                    <td className="px-2 py-2">
                      <Link
                        href={`/w/${slug}/reports/${r.id}`}
                        className="font-medium text-accent underline-offset-2 hover:underline"
                      >
                        {r.name}
                      </Link>
                    </td>
                    <td className="figure px-2 py-2 whitespace-nowrap">
                      {r.periodFrom} to {r.periodTo}
                    </td>
                    <td className="px-2 py-2 text-ink-soft">{r.fleetNames.join(', ')}</td>
                    <td className="px-2 py-2 text-ink-soft">
                      {formatDateTime(r.createdAt)}
                      {r.createdBy ? <span className="block text-xs text-ink-faint">by {r.createdBy}</span> : null}
                    </td>
                    <td className="px-2 py-2 text-ink-soft">
                      {r.sends
                        ? `${r.sends === 1 ? 'Once' : `${r.sends} times`}, last ${formatDateTime(r.lastSentAt)}`
                        : 'Not yet'}
                    </td>
                    <td className="px-2 py-2 whitespace-nowrap">
                      <a
                        href={`${base}/${r.id}/pdf`}
                        download
                        className="text-accent underline-offset-2 hover:underline"
                        aria-label={`Download the PDF of ${r.name}`}
                      >
                        PDF
                      </a>
                      <span className="text-xs text-ink-faint"> {kb(r.pdfBytes)}</span>
                      <span className="mx-1.5 text-ink-faint">·</span>
                      <a
                        href={`${base}/${r.id}/csv`}
                        download
                        className="text-accent underline-offset-2 hover:underline"
                        aria-label={`Download the CSV of ${r.name}`}
                      >
                        CSV
                      </a>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>
      <div className="mt-6">
        <ScreeningCaution />
      </div>
    </>
  );
}
