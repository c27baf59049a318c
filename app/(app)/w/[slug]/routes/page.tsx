import { can } from '@/lib/auth/policy';
import { listRoutes } from '@/db/routes';
import { routeLengthKm } from '@/lib/library/routes';
import { ButtonLink } from '@/components/ui/button';
import { formatDistance } from '@/lib/format';
import { RouteForm } from '@/components/library/route-form';
import { routeLine } from '@/components/library/format';
import { libraryMember, LibraryList, LibraryPage, NameCell } from '@/components/library/library-page';
import { saveRouteAction } from './actions';

export const metadata = { title: 'Saved routes' };

export default async function RoutesPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug, workspace, user, role, canWrite } = await libraryMember(params, 'flights:read');
  const routes = await listRoutes({ workspaceId: workspace.id });
  const canScreen = can(role, 'screenings:create');
  return (
    <LibraryPage
      title="Saved routes"
      lead="Named routes you screen again and again, as airport codes or positions in order. Distances are great-circle lengths through the waypoints."
      asideWidth="narrow"
      canWrite={canWrite}
      forms={[
        {
          title: 'New route',
          body: <RouteForm action={saveRouteAction.bind(null, slug, null)} detailBase={`/w/${slug}/routes`} />,
        },
      ]}
    >
      <LibraryList
        count={routes.length}
        noun="saved route"
        canWrite={canWrite}
        empty={EMPTY}
        columns={[
          { label: 'Route' },
          { label: 'Waypoints' },
          { label: 'Great-circle distance', right: true },
          { label: <span className="sr-only">Actions</span> },
        ]}
      >
        {routes.map((r) => (
          <tr key={r.id} className="border-t border-line align-top">
            <NameCell href={`/w/${slug}/routes/${r.id}`} name={r.name}>
              {r.notes ? <div className="mt-0.5 line-clamp-2 max-w-xs text-xs text-ink-soft">{r.notes}</div> : null}
            </NameCell>
            <td className="py-2 pr-3 font-mono text-xs text-ink">{routeLine(r.waypoints)}</td>
            <td className="figure py-2 pr-3 text-right whitespace-nowrap">
              {formatDistance(routeLengthKm(r), user.units)}
            </td>
            <td className="py-2 text-right whitespace-nowrap">
              {canScreen ? (
                <ButtonLink
                  variant="secondary"
                  href={`/w/${slug}/screen?route=${r.id}`}
                  className="px-2.5 py-1 text-xs"
                >
                  Screen this route
                </ButtonLink>
              ) : null}
            </td>
          </tr>
        ))}
      </LibraryList>
    </LibraryPage>
  );
}

const EMPTY = {
  title: 'No saved routes yet',
  writers:
    'Add the routes you fly often with the form: list the airports (EGLL, KSEA) or positions one per line, then screen them from here in one click.',
  readers: 'A planner in this workspace can add routes here; they will show up for you to read.',
};
