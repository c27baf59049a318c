import Link from 'next/link';
import { notFound } from 'next/navigation';
import { isAppError, requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { aircraftTypeSaveOf, getAircraftType, listEngines, listFleetChoices } from '@/db/engines';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { formatNumber } from '@/lib/format';
import { AircraftTypeForm } from '@/components/library/aircraft-type-form';
import { DeleteButton } from '@/components/ui/delete-button';
import { deleteAircraftTypeAction, saveAircraftTypeAction } from '../../actions';

export const metadata = { title: 'Aircraft type' };

export default async function AircraftTypePage({ params }: { params: Promise<{ slug: string; id: string }> }) {
  const { slug, id: rawId } = await params;
  const { workspace, role } = await requireMember(slug, 'flights:read');
  if (!/^\d{1,12}$/.test(rawId)) notFound();
  const scope = { workspaceId: workspace.id };
  const [type, engines, fleets] = await Promise.all([
    getAircraftType(scope, Number(rawId)).catch((err: unknown) => {
      if (isAppError(err) && err.status === 404) notFound();
      throw err;
    }),
    listEngines(scope),
    listFleetChoices(scope),
  ]);
  const canWrite = can(role, 'library:write');
  return (
    <>
      <PageHeader title={<span className="font-mono">{type.code}</span>} lead={type.name || undefined} />
      <div className="mb-6 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Stat
          label="Emission"
          value={
            <span className="text-base">
              {type.engineId !== null ? (
                <>
                  {type.engineCount} ×{' '}
                  <Link href={`/w/${slug}/engines/${type.engineId}`} className="text-accent hover:underline">
                    {type.engineName}
                  </Link>
                </>
              ) : type.directEiGPerKg !== null ? (
                `Direct EI NOx ${formatNumber(type.directEiGPerKg, 1)} g/kg`
              ) : (
                'None'
              )}
            </span>
          }
        />
        <Stat label="Typical cruise flight level" value={`FL${String(type.typicalFlightLevel).padStart(3, '0')}`} />
        <Stat label="Typical cruise Mach" value={formatNumber(type.typicalMach, 2)} />
        <Stat label="Default fleet" value={<span className="text-base">{type.defaultFleetName ?? 'None'}</span>} />
      </div>
      {canWrite ? (
        <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(16rem,1fr)]">
          <Card title="Change this aircraft type">
            <AircraftTypeForm
              action={saveAircraftTypeAction.bind(null, slug, type.id)}
              initial={aircraftTypeSaveOf(type)}
              engines={engines.map((e) => ({ id: e.id, name: e.name }))}
              fleets={fleets}
              fleetsHref={`/w/${slug}/fleets`}
            />
          </Card>
          <Card title="Delete">
            <p className="mb-3 text-sm text-ink-soft">
              Flights and screenings already made with this type keep their figures and the type code.
            </p>
            <DeleteButton
              action={deleteAircraftTypeAction.bind(null, slug, type.id)}
              confirmText={`Delete aircraft type ${type.code}?`}
              label="Delete type"
              after={`/w/${slug}/engines`}
            />
          </Card>
        </div>
      ) : null}
    </>
  );
}
