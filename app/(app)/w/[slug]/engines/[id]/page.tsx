import Link from 'next/link';
import { notFound } from 'next/navigation';
import { isAppError, requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { engineSaveOf, getEngine, listAircraftTypes } from '@/db/engines';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { formatDateTime, formatNumber } from '@/lib/format';
import { LTO_MODES } from '@/lib/validation/library';
import { DemoBadge } from '@/components/library/badges';
import { CruiseCheckTag } from '@/components/library/cruise-check-tag';
import { CRUISE_CHECK, cruiseEiCheck } from '@/lib/library/cruise-ei-check';
import { formatFuelFlow, fuelFlowUnit } from '@/components/library/format';
import { EngineForm } from '@/components/library/engine-form';
import { DeleteButton } from '@/components/ui/delete-button';
import { deleteEngineAction, saveEngineAction } from '../actions';

export const metadata = { title: 'Engine' };

export default async function EnginePage({ params }: { params: Promise<{ slug: string; id: string }> }) {
  const { slug, id: rawId } = await params;
  const { workspace, user, role } = await requireMember(slug, 'flights:read');
  if (!/^\d{1,12}$/.test(rawId)) notFound();
  const scope = { workspaceId: workspace.id };
  const [engine, types] = await Promise.all([
    getEngine(scope, Number(rawId)).catch((err: unknown) => {
      if (isAppError(err) && err.status === 404) notFound();
      throw err;
    }),
    listAircraftTypes(scope),
  ]);
  const canWrite = can(role, 'library:write');
  const usedBy = types.filter((t) => t.engineId === engine.id);
  const check = cruiseEiCheck(engine);
  return (
    <>
      <PageHeader
        title={
          <>
            {engine.name}
            {engine.isDemo ? <DemoBadge /> : null}
          </>
        }
        lead={engine.source || 'No source noted for these values.'}
      />
      <div className="mb-6 grid gap-3 sm:grid-cols-3">
        <Stat
          label={`Cruise check, FL${CRUISE_CHECK.flightLevel} M${CRUISE_CHECK.mach.toFixed(2)} ISA`}
          value={<CruiseCheckTag check={check} />}
          sub={`at ${formatFuelFlow(check.fuelFlowPerEngineKgS, user.units)} ${fuelFlowUnit(user.units)} per engine`}
        />
        <Stat
          label="Used by"
          value={
            usedBy.length ? (
              <span className="text-base">
                {usedBy.map((t, i) => (
                  <span key={t.id}>
                    {i ? ', ' : ''}
                    <Link
                      href={`/w/${slug}/engines/aircraft/${t.id}`}
                      className="font-mono text-accent hover:underline"
                    >
                      {t.code}
                    </Link>
                  </span>
                ))}
              </span>
            ) : (
              <span className="text-base text-ink-faint">No aircraft type</span>
            )
          }
        />
        <Stat label="Last changed" value={<span className="text-base">{formatDateTime(engine.updatedAt)}</span>} />
      </div>
      <div className={canWrite ? 'grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(20rem,1fr)]' : ''}>
        <div className="space-y-6">
          <Card title="Certification data per engine">
            <table className="w-full text-sm">
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th scope="col" className="py-2 pr-3">
                    LTO mode
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right">
                    Thrust
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right">
                    Fuel flow, {fuelFlowUnit(user.units)}
                  </th>
                  <th scope="col" className="py-2 text-right">
                    EI NOx, g/kg
                  </th>
                </tr>
              </thead>
              <tbody>
                {LTO_MODES.map((m, i) => (
                  <tr key={m.key} className="border-t border-line">
                    <td className="py-1.5 pr-3">{m.label}</td>
                    <td className="figure py-1.5 pr-3 text-right text-ink-soft">{m.thrust}</td>
                    <td className="figure py-1.5 pr-3 text-right">
                      {formatFuelFlow(engine.fuelFlowKgS[i], user.units)}
                    </td>
                    <td className="figure py-1.5 text-right">{formatNumber(engine.eiNoxGPerKg[i], 2)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
          <Notice tone="caution">
            The cruise check is a plausibility figure (BFFM2 at a cruise fuel flow of{' '}
            {Math.round(CRUISE_CHECK.takeOffFraction * 100)} % of take-off, our rule of thumb), not what a flight emits.
            Screenings are estimates for planning and reporting support, not a certified emissions inventory.
          </Notice>
        </div>
        {canWrite ? (
          <div className="space-y-6">
            <Card title="Change this engine">
              {engine.isDemo ? (
                <p className="mb-3 text-sm text-ink-soft">Saving your own values removes the demo-data mark.</p>
              ) : null}
              <EngineForm action={saveEngineAction.bind(null, slug, engine.id)} initial={engineSaveOf(engine)} />
            </Card>
            <Card title="Delete">
              <p className="mb-3 text-sm text-ink-soft">
                An engine that an aircraft type still uses cannot be deleted; change or delete those types first.
              </p>
              <DeleteButton
                action={deleteEngineAction.bind(null, slug, engine.id)}
                confirmText={`Delete the engine “${engine.name}”?`}
                label="Delete engine"
                after={`/w/${slug}/engines`}
              />
            </Card>
          </div>
        ) : null}
      </div>
    </>
  );
}
