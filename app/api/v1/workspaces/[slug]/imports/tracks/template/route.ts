import { workspaceRoute } from '@/lib/api/handler';
import { listAircraftForScreening } from '@/db/aircraft-lookup';
import { trackTemplateCsv } from '@/lib/imports/tracks';
import { todayIso } from '@/lib/clock';

/** A flown-track CSV template: two short invented flights with fuel flows, on one of this workspace's aircraft types. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  const types = await listAircraftForScreening({ workspaceId: member.workspace.id });
  const aircraft =
    [...types.values()]
      .filter((t) => t.emission !== null)
      .map((t) => t.code)
      .sort()[0] ?? 'YOUR-TYPE';
  return new Response(trackTemplateCsv({ aircraft, day: todayIso() }), {
    status: 200,
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="track-template-${member.workspace.slug}.csv"`,
    },
  });
});
