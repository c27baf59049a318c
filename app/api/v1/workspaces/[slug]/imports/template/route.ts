import { workspaceRoute } from '@/lib/api/handler';
import { listAircraftForScreening } from '@/db/aircraft-lookup';
import { listFleetsByName } from '@/db/flights';
import { scheduleTemplateCsv } from '@/lib/imports/schedule-template';
import { todayIso } from '@/lib/clock';

/** A schedule CSV template with example rows that use this workspace's aircraft types and fleets. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  const scope = { workspaceId: member.workspace.id };
  const [types, fleets] = await Promise.all([listAircraftForScreening(scope), listFleetsByName(scope)]);
  // Only types that can be screened as they stand, so the template imports without an edit.
  const aircraft = [...types.values()]
    .filter((t) => t.emission !== null)
    .map((t) => t.code)
    .sort();
  const csv = scheduleTemplateCsv({
    aircraft,
    fleets: [...fleets.values()].map((f) => f.name).sort(),
    day: todayIso(),
  });
  return new Response(csv, {
    status: 200,
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="schedule-template-${member.workspace.slug}.csv"`,
    },
  });
});
