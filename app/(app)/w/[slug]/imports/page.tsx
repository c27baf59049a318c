import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listImports } from '@/db/imports';
import { listAircraftForScreening } from '@/db/aircraft-lookup';
import { listFleetsByName } from '@/db/flights';
import { scheduleTemplateCsv } from '@/lib/imports/schedule-template';
import { todayIso } from '@/lib/clock';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { FormatReference, FormatSummary } from '@/components/imports/format-guide';
import { UploadForm } from '@/components/imports/upload-form';
import { TrackUploadForm } from '@/components/imports/track-upload';
import { TrackFormatGuide } from '@/components/imports/track-format-guide';
import { trackTemplateCsv } from '@/lib/imports/tracks';
import { ImportList } from '@/components/imports/import-list';
import { FailedJobs } from '@/components/jobs/failed-jobs';
import { listFailedJobs } from '@/lib/jobs/failed-jobs';
import { deleteImportAction, rescreenImportAction, retryFailedJobAction } from './actions';
import { ENGINE_VERSION } from '@/lib/screening';

export const metadata = { title: 'Imports' };

export default async function ImportsPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace, role } = await requireMember(slug, 'flights:read');
  const scope = { workspaceId: workspace.id };
  const canManageJobs = can(role, 'jobs:manage');
  const [imports, types, fleets, failedJobs] = await Promise.all([
    listImports(scope, { limit: 50 }),
    listAircraftForScreening(scope),
    listFleetsByName(scope),
    canManageJobs ? listFailedJobs(scope) : Promise.resolve([]),
  ]);
  const canUpload = can(role, 'imports:create');
  const canDelete = can(role, 'imports:delete');
  const codes = [...types.values()]
    .filter((t) => t.emission !== null)
    .map((t) => t.code)
    .sort();
  const example = scheduleTemplateCsv({
    aircraft: codes,
    fleets: [...fleets.values()].map((f) => f.name).sort(),
    day: todayIso(),
  })
    .trim()
    .replace(/\r/g, '');
  const templateHref = `/api/v1/workspaces/${slug}/imports/template`;

  return (
    <>
      <PageHeader
        title="Schedule imports"
        lead="Upload a flight schedule as CSV. Every row is checked before anything is saved; accepted flights are screened in the background, and each screened flight is one billable unit."
        actions={
          <ButtonLink href={`/w/${slug}/flights`} variant="secondary">
            Flights
          </ButtonLink>
        }
      />
      <Card title="Upload a schedule">
        {canUpload ? (
          codes.length ? (
            <UploadForm slug={slug} aside={<FormatSummary templateHref={templateHref} />} />
          ) : (
            <Notice tone="caution" title="Add an aircraft type first">
              Each row names an aircraft type of this workspace, which supplies its EI NOx and typical Mach. Add one
              with engine data or a direct EI NOx under Engines &amp; aircraft, then upload.
            </Notice>
          )
        ) : (
          <div className="grid gap-6 md:grid-cols-2">
            <p className="text-sm text-ink-soft">
              Your role can read imports but not upload them. A flight planner, analyst or owner uploads schedules.
            </p>
            <FormatSummary templateHref={templateHref} />
          </div>
        )}
      </Card>
      <Card title="Upload flown tracks" className="mt-6">
        <div className="space-y-6">
          {canUpload && codes.length ? (
            <TrackUploadForm slug={slug} />
          ) : (
            <p className="text-sm text-ink-soft">
              {canUpload
                ? 'Add an aircraft type first: each flown flight is screened with its type’s engine or EI NOx.'
                : 'Your role can read imports but not upload them.'}
            </p>
          )}
          <div className="min-w-0 border-t border-line pt-4">
            <TrackFormatGuide
              templateHref={`/api/v1/workspaces/${slug}/imports/tracks/template`}
              example={trackTemplateCsv({ aircraft: codes[0] ?? 'YOUR-TYPE', day: todayIso() })
                .trim()
                .replace(/\r/g, '')}
            />
          </div>
        </div>
      </Card>
      <Card title="Imports" className="mt-6">
        {imports.items.length === 0 ? (
          <EmptyState title="No schedule imported yet">
            {canUpload
              ? 'Download the template, fill in your flights and upload it above; progress shows here while the flights are screened.'
              : 'Imports appear here once a planner, analyst or owner uploads a schedule.'}
          </EmptyState>
        ) : (
          <>
            <ImportList
              slug={slug}
              imports={imports.items}
              canDelete={canDelete}
              onDelete={deleteImportAction.bind(null, slug)}
              canRescreen={canUpload}
              onRescreen={rescreenImportAction.bind(null, slug)}
              currentEngineVersion={ENGINE_VERSION}
            />
            {imports.nextCursor ? (
              <p className="mt-2 text-xs text-ink-soft">
                Showing the 50 newest imports; older ones stay listed in the Import filter of Flights.
              </p>
            ) : null}
            {canDelete ? (
              <p className="mt-2 text-xs text-ink-soft">
                Deleting an import removes its flights. Units already billed for flights it screened stay billed.
              </p>
            ) : null}
          </>
        )}
      </Card>
      {canManageJobs ? (
        <section id="background-jobs" className="mt-6 scroll-mt-6">
          <Card title="Background jobs">
            <FailedJobs jobs={failedJobs} onRetry={retryFailedJobAction.bind(null, slug)} />
          </Card>
        </section>
      ) : null}
      <section id="format" className="mt-6 scroll-mt-6">
        <Card title="Column reference">
          <FormatReference example={example} />
        </Card>
      </section>
    </>
  );
}
