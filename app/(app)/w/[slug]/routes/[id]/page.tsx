import { notFound } from 'next/navigation';
import { isAppError, requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { getRoute } from '@/db/routes';
import { routeLengthKm } from '@/lib/library/routes';
import { findAirport } from '@/lib/screening';
import { legDistanceKm, resolveWaypoints } from '@/lib/screening/great-circle';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { formatDateTime, formatDistance } from '@/lib/format';
import { formatWaypointLines } from '@/lib/validation/library';
import { RouteForm } from '@/components/library/route-form';
import { DeleteButton } from '@/components/ui/delete-button';
import { waypointLabel } from '@/components/library/format';
import { deleteRouteAction, saveRouteAction } from '../actions';

export const metadata = { title: 'Saved route' };

export default async function RoutePage({ params }: { params: Promise<{ slug: string; id: string }> }) {
  const { slug, id: rawId } = await params;
  const { workspace, user, role } = await requireMember(slug, 'flights:read');
  if (!/^\d{1,12}$/.test(rawId)) notFound();
  const id = Number(rawId);
  const route = await getRoute({ workspaceId: workspace.id }, id).catch((err: unknown) => {
    if (isAppError(err) && err.status === 404) notFound();
    throw err;
  });
  const canWrite = can(role, 'library:write');
  const { lat, lon } = resolveWaypoints(route.waypoints, 'waypoints');
  const legs = route.waypoints.map((w, i) => ({
    label: waypointLabel(w),
    name: 'airport' in w ? (findAirport(w.airport)?.name ?? '') : 'Position',
    legKm: i === 0 ? null : legDistanceKm(lat[i - 1], lon[i - 1], lat[i], lon[i]),
  }));
  return (
    <>
      <PageHeader
        title={route.name}
        lead={route.notes || undefined}
        actions={
          can(role, 'screenings:create') ? (
            <ButtonLink href={`/w/${slug}/screen?route=${route.id}`}>Screen this route</ButtonLink>
          ) : undefined
        }
      />
      <div className="mb-6 grid gap-3 sm:grid-cols-3">
        <Stat label="Great-circle distance" value={formatDistance(routeLengthKm(route), user.units)} />
        <Stat label="Waypoints" value={route.waypoints.length} />
        <Stat label="Last changed" value={<span className="text-base">{formatDateTime(route.updatedAt)}</span>} />
      </div>
      <div className={canWrite ? 'grid items-start gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(18rem,2fr)]' : ''}>
        <Card title="Waypoints">
          <div className="overflow-x-auto">
            <table className="w-full text-sm">
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th scope="col" className="py-2 pr-3">
                    #
                  </th>
                  <th scope="col" className="py-2 pr-3">
                    Waypoint
                  </th>
                  <th scope="col" className="py-2 pr-3">
                    Airport
                  </th>
                  <th scope="col" className="py-2 text-right">
                    Leg from previous
                  </th>
                </tr>
              </thead>
              <tbody>
                {legs.map((l, i) => (
                  <tr key={i} className="border-t border-line">
                    <td className="figure py-1.5 pr-3 text-ink-soft">{i + 1}</td>
                    <td className="py-1.5 pr-3 font-mono text-xs">{l.label}</td>
                    <td className="py-1.5 pr-3 text-ink-soft">{l.name}</td>
                    <td className="figure py-1.5 text-right">
                      {l.legKm === null ? '—' : formatDistance(l.legKm, user.units)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Card>
        {canWrite ? (
          <div className="space-y-6">
            <Card title="Change this route">
              <RouteForm
                action={saveRouteAction.bind(null, slug, route.id)}
                detailBase={`/w/${slug}/routes`}
                initial={{ name: route.name, waypointsText: formatWaypointLines(route.waypoints), notes: route.notes }}
              />
            </Card>
            <Card title="Delete">
              <p className="mb-3 text-sm text-ink-soft">
                Screenings already saved from this route keep their own copy of the waypoints.
              </p>
              <DeleteButton
                action={deleteRouteAction.bind(null, slug, route.id)}
                confirmText={`Delete the saved route “${route.name}”?`}
                label="Delete route"
                after={`/w/${slug}/routes`}
              />
            </Card>
          </div>
        ) : null}
      </div>
    </>
  );
}
