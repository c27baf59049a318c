import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listAircraftTypes, listEngines, listFleetChoices } from '@/db/engines';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { AircraftTypeTable, CruiseCheckNotice, EngineTable } from '@/components/library/engine-lists';
import { EngineForm } from '@/components/library/engine-form';
import { EngineImportForm } from '@/components/library/engine-import-form';
import { AircraftTypeForm } from '@/components/library/aircraft-type-form';
import { saveAircraftTypeAction, saveEngineAction } from './actions';

export const metadata = { title: 'Engines & aircraft' };

export default async function EnginesPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace, user, role } = await requireMember(slug, 'flights:read');
  const scope = { workspaceId: workspace.id };
  const [engines, types, fleets] = await Promise.all([
    listEngines(scope),
    listAircraftTypes(scope),
    listFleetChoices(scope),
  ]);
  const canWrite = can(role, 'library:write');
  const units = user.units;
  return (
    <>
      <PageHeader
        title="Engines & aircraft"
        lead="The certification data behind every screening: engines with their four LTO-mode fuel flows and EI NOx, and the aircraft types that fly them."
      />

      <section aria-labelledby="types-heading" className="mb-10 space-y-6">
        <Card title={<span id="types-heading">Aircraft types</span>}>
          {types.length === 0 ? (
            <EmptyState title="No aircraft types yet">
              {canWrite
                ? 'Add a type below: choose its engine (or give a direct EI NOx), the engine count and its usual cruise. Schedules and screenings refer to types by code.'
                : 'A planner in this workspace can add aircraft types here.'}
            </EmptyState>
          ) : (
            <AircraftTypeTable slug={slug} types={types} />
          )}
        </Card>
        {canWrite ? (
          <Card title="New aircraft type" className="max-w-3xl">
            <AircraftTypeForm
              action={saveAircraftTypeAction.bind(null, slug, null)}
              engines={engines.map((e) => ({ id: e.id, name: e.name }))}
              fleets={fleets}
              fleetsHref={`/w/${slug}/fleets`}
            />
          </Card>
        ) : null}
      </section>

      <section aria-labelledby="engines-heading" className="space-y-6">
        <Card title={<span id="engines-heading">Engines</span>}>
          {engines.length === 0 ? (
            <EmptyState title="No engines yet">
              {canWrite
                ? 'Add an engine from its certification data sheet with the form below, or import several at once from a CSV.'
                : 'A planner in this workspace can add engines here.'}
            </EmptyState>
          ) : (
            <EngineTable slug={slug} engines={engines} types={types} units={units} />
          )}
          <CruiseCheckNotice />
        </Card>
        {canWrite ? (
          <div className="grid gap-6 lg:grid-cols-2">
            <Card title="New engine">
              <EngineForm action={saveEngineAction.bind(null, slug, null)} />
            </Card>
            <Card title="Import engines from CSV">
              <EngineImportForm slug={slug} />
            </Card>
          </div>
        ) : null}
      </section>
    </>
  );
}
