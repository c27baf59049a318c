import { notFound } from 'next/navigation';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { getReport, listReportSends } from '@/db/reports';
import { AppError } from '@/lib/errors';
import { formatDateTime, formatDistance, formatMass, formatMassRange, formatNumber, formatPercent } from '@/lib/format';
import type { CompareRow } from '@/lib/fleets/types';
import type { ReportSummary } from '@/lib/reports/model';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { buttonClass } from '@/components/ui/button';
import { ScreeningCaution } from '@/components/ui/notice';
import { FleetContext } from '@/components/fleets/fleet-context';
import { FleetNoxChart } from '@/components/charts/fleet-nox-chart';
import { ReportSendForm } from '@/components/reports/send-form';
import { DeleteButton } from '@/components/ui/delete-button';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { deleteReportAction, sendReportAction } from '../actions';
import { COUNT_LABELS } from '@/lib/counts';
import { TableHead } from '@/components/ui/table-head';

export const metadata = { title: 'Fleet report' };

const SEND_LABEL = { queued: 'Queued', sent: 'Sent', failed: 'Failed' } as const;
const SEND_TONE = { queued: 'text-ink', sent: 'text-tropo-strong', failed: 'text-danger' } as const;

export default async function ReportPage({ params }: { params: Promise<{ slug: string; id: string }> }) {
  const { slug, id: rawId } = await params;
  const { workspace, role, user } = await requireMember(slug, 'flights:read');
  if (!/^\d{1,12}$/.test(rawId)) notFound();
  const scope = { workspaceId: workspace.id };
  const id = Number(rawId);
  const [report, sends] = await Promise.all([
    getReport<ReportSummary>(scope, id).catch((err: unknown) => {
      if (err instanceof AppError && err.code === 'not_found') notFound();
      throw err;
    }),
    listReportSends(scope, id),
  ]);
  const s = report.summary;
  const t = s.totals;
  const u = user.units;
  const base = `/api/v1/workspaces/${slug}/reports/${report.id}`;
  const share = (r: CompareRow) => (r.shareAbove === null ? '–' : formatPercent(r.shareAbove, 1));

  return (
    <>
      <PageHeader
        title={report.name}
        lead={`${s.period.from} to ${s.period.to} (${s.period.days} days) · ${s.fleets.map((f) => f.name).join(', ')} · built ${formatDateTime(s.generatedAt)} by ${s.generatedBy}`}
        actions={
          <>
            <a href={`${base}/pdf`} download className={buttonClass('primary')}>
              Download PDF
            </a>
            <a href={`${base}/csv`} download className={buttonClass('secondary')}>
              Download CSV
            </a>
          </>
        }
      />
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Stat
          label={COUNT_LABELS.importedFlightsScreened}
          value={formatNumber(t.flights)}
          sub={formatDistance(t.distanceKm, u)}
        />
        <Stat
          label="NOx emitted"
          value={formatMass(t.noxTotalKg, u)}
          sub={`as NO2 · fuel ${formatMass(t.fuelKg, u)}`}
        />
        <Stat
          label="NOx above tropopause"
          value={formatMass(t.noxAboveKg, u)}
          sub={`${share(t)} of NOx`}
          tone="strato"
        />
        <Stat
          label="Ozone-loss figure (gross)"
          value={formatMass(t.ozone.centralKg, u)}
          sub={formatMassRange(t.ozone.lowKg, t.ozone.highKg, u)}
          tone="strato"
        />
      </div>
      <div className="mt-4">
        <ScreeningCaution />
      </div>

      <div className="mt-6">
        <Card title="Per fleet">
          <ScrollRegion label="Per-fleet figures">
            <table className="figure w-full min-w-[640px] text-sm">
              <TableHead
                className="border-b border-line-strong text-left text-xs uppercase tracking-wide text-ink-soft"
                pad="px-2 py-2"
                gap=""
                cellClassName="font-medium"
                columns={[
                  'Fleet',
                  { label: 'Flights', right: true },
                  { label: 'CO2', right: true },
                  { label: 'NOx above', right: true },
                  { label: 'Share above', right: true },
                  { label: 'Ozone figure', right: true },
                ]}
              />
              <tbody>
                {[...s.perFleet, t].map((r, i) => (
                  <tr
                    key={r.key}
                    className={`border-b border-line ${i === s.perFleet.length ? 'bg-paper-sunk font-semibold' : ''}`}
                  >
                    <td className="whitespace-nowrap px-2 py-2">
                      {i === s.perFleet.length ? 'All fleets' : r.fleetName}
                    </td>
                    <td className="whitespace-nowrap px-2 py-2 text-right">{formatNumber(r.flights)}</td>
                    <td className="whitespace-nowrap px-2 py-2 text-right">{formatMass(r.co2Kg, u)}</td>
                    <td className="whitespace-nowrap px-2 py-2 text-right text-strato-strong">
                      {formatMass(r.noxAboveKg, u)}
                    </td>
                    <td className="whitespace-nowrap px-2 py-2 text-right">{share(r)}</td>
                    <td className="whitespace-nowrap px-2 py-2 text-right">
                      {formatMass(r.ozone.centralKg, u)}
                      <span className="block text-xs font-normal text-ink-faint">
                        {formatMassRange(r.ozone.lowKg, r.ozone.highKg, u)}
                      </span>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
          <p className="mt-2 text-xs text-ink-soft">
            {s.notes.co2} {s.notes.ratios}
          </p>
          {s.months.length ? (
            <div className="mt-5">
              <h3 className="mb-2 text-sm font-semibold text-ink">NOx above the tropopause by month</h3>
              <FleetNoxChart months={s.months} series={s.series} units={u} height={240} />
            </div>
          ) : null}
        </Card>
      </div>
      <div className="mt-6 grid gap-6 lg:grid-cols-2">
        {can(role, 'reports:send') ? (
          <Card title="Send by e-mail">
            <ReportSendForm slug={slug} reportId={report.id} action={sendReportAction} />
          </Card>
        ) : null}
        <Card title="E-mail history">
          {sends.length === 0 ? (
            <p className="text-sm text-ink-soft">
              Not sent yet.{can(role, 'reports:send') ? ' Use the form to send the PDF.' : ''}
            </p>
          ) : (
            <>
              <ul className="divide-y divide-line text-sm" aria-label="E-mail history">
                {sends.map((x) => (
                  <li key={x.id} className="py-2">
                    <span className={`font-medium ${SEND_TONE[x.status]}`}>{SEND_LABEL[x.status]}</span>{' '}
                    {formatDateTime(x.sentAt ?? x.failedAt ?? x.queuedAt)}
                    {x.sentBy ? ` by ${x.sentBy}` : ''}
                    <span className="block text-xs text-ink-soft">To {x.recipients.join(', ')}</span>
                    {x.status === 'queued' ? (
                      <span className="block text-xs text-ink-soft">
                        Waiting to go out
                        {x.attempts > 0 ? ` (${x.attempts} attempt${x.attempts === 1 ? '' : 's'} so far)` : ''}.
                      </span>
                    ) : null}
                    {x.error ? <span className="block text-xs text-danger">{x.error}</span> : null}
                  </li>
                ))}
              </ul>
              <p className="mt-3 text-sm">
                <a href={`/w/${slug}/reports/${report.id}`} className="font-medium text-tropo-strong underline">
                  Refresh
                </a>{' '}
                <span className="text-ink-soft">
                  E-mails go out in the background; refresh to see queued ones sent.
                </span>
              </p>
            </>
          )}
        </Card>
      </div>
      <div className="mt-6">
        <FleetContext context={s.context} cautions={s.cautions} units={u} />
      </div>
      {can(role, 'reports:delete') ? (
        <div className="mt-6 max-w-xl">
          <Card title="Delete">
            <p className="mb-3 text-sm text-ink-soft">
              Removes the stored PDF and CSV and the e-mail history. Copies already downloaded or e-mailed are not
              affected; the audit log keeps a record of the deletion.
            </p>
            <DeleteButton
              action={deleteReportAction.bind(null, slug, report.id)}
              confirmText={`Delete the report “${report.name}” with its files and e-mail history?`}
              label="Delete report"
              after={`/w/${slug}/reports`}
            />
          </Card>
        </div>
      ) : null}
    </>
  );
}
