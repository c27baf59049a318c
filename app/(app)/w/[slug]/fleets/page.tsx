import Link from 'next/link';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listFleets, listFlownAircraftCodes } from '@/db/fleets';
import { listAircraftTypes } from '@/db/engines';
import { compareFleets } from '@/lib/fleets/compare';
import { compareQueryObject, compareQueryString } from '@/lib/fleets/url';
import { fleetCompareQuerySchema } from '@/lib/validation/fleets';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { FleetComparison } from '@/components/fleets/fleet-comparison';
import { AircraftFleetTable, CreateFleetForm, FleetList } from '@/components/fleets/fleet-manager';
import { listPeriodOptions } from '@/lib/periods/service';
import { PeriodSelect } from '@/components/periods/period-select';
import { assignAircraftFleetAction, createFleetAction, deleteFleetAction, updateFleetAction } from './actions';

export const metadata = { title: 'Fleets' };

type SearchParams = Record<string, string | string[] | undefined>;

export default async function FleetsPage({
  params,
  searchParams,
}: {
  params: Promise<{ slug: string }>;
  searchParams: Promise<SearchParams>;
}) {
  const { slug } = await params;
  const { workspace, role, user } = await requireMember(slug, 'flights:read');
  const sp = await searchParams;
  const scope = { workspaceId: workspace.id };
  const parsed = fleetCompareQuerySchema.safeParse(compareQueryObject(sp));
  const [fleets, types, codes, initial, periodOptions] = await Promise.all([
    listFleets(scope),
    listAircraftTypes(scope),
    listFlownAircraftCodes(scope),
    parsed.success ? compareFleets(scope, parsed.data) : Promise.resolve(null),
    listPeriodOptions(scope),
  ]);
  const periodChosen = periodOptions.find((o) => o.from === sp.from && o.to === sp.to);
  const canWrite = can(role, 'fleets:write');
  const actions = {
    create: createFleetAction,
    update: updateFleetAction,
    remove: deleteFleetAction,
    assign: assignAircraftFleetAction,
  };
  return (
    <>
      <PageHeader
        title="Fleets"
        lead="Compare fleets by the NOx they put above the tropopause, month by month. A flight counts in the fleet named in its schedule row, else in its aircraft type's default fleet."
        actions={
          can(role, 'reports:create') ? (
            <ButtonLink href={`/w/${slug}/reports`} variant="secondary">
              Fleet reports
            </ButtonLink>
          ) : undefined
        }
      />
      <div className="mb-4">
        <PeriodSelect
          id="fleets-period"
          label="Reporting period"
          options={periodOptions}
          value={periodChosen?.ref ?? ''}
          hrefFor={{ path: `/w/${slug}/fleets`, mode: 'range' }}
        />
        {periodChosen && periodChosen.state !== 'open' ? (
          <p className="mt-2 text-sm text-ink-soft">
            {periodChosen.name} is {periodChosen.state === 'signed' ? 'signed' : 'in review'}: the comparison below
            shows the flights as they are now; its frozen figures are on{' '}
            <Link href={`/w/${slug}/periods/${periodChosen.ref}`} className="text-accent underline underline-offset-2">
              the period&apos;s page
            </Link>
            .
          </p>
        ) : null}
      </div>
      <FleetComparison
        slug={slug}
        units={user.units}
        initial={initial}
        initialQuery={compareQueryString(sp)}
        aircraftCodes={codes}
        fleets={fleets.map((f) => ({ id: f.id, name: f.name }))}
        canReport={can(role, 'reports:create')}
      />
      <div className="mt-6 grid gap-6 lg:grid-cols-2">
        <Card title={`Fleets (${fleets.length})`}>
          {fleets.length === 0 ? (
            <EmptyState title="No fleets yet">
              {canWrite
                ? 'Create a fleet, then give your aircraft types a default fleet so their flights are grouped.'
                : 'An analyst or the owner can create fleets.'}
            </EmptyState>
          ) : (
            <FleetList slug={slug} fleets={fleets} actions={actions} canWrite={canWrite} />
          )}
          {canWrite ? (
            <div className="mt-5 border-t border-line pt-4">
              <h3 className="mb-3 text-sm font-semibold text-ink">New fleet</h3>
              <CreateFleetForm slug={slug} action={createFleetAction} />
            </div>
          ) : null}
        </Card>
        <Card title="Default fleet of each aircraft type">
          {types.length === 0 ? (
            <EmptyState
              title="No aircraft types yet"
              action={
                <ButtonLink href={`/w/${slug}/engines`} variant="secondary">
                  Engines &amp; aircraft
                </ButtonLink>
              }
            >
              Add aircraft types first; each can then default to a fleet.
            </EmptyState>
          ) : (
            <>
              <p className="mb-3 text-sm text-ink-soft">
                Flights whose schedule row names no fleet count in their type&apos;s default fleet. Changing it regroups
                those flights everywhere, past ones included.
              </p>
              <AircraftFleetTable
                slug={slug}
                types={types.map((t) => ({ id: t.id, code: t.code, name: t.name, defaultFleetId: t.defaultFleetId }))}
                fleets={fleets}
                action={assignAircraftFleetAction}
                canWrite={canWrite}
              />
            </>
          )}
        </Card>
      </div>
    </>
  );
}
