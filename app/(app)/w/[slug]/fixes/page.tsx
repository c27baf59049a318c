import { csvDataHref } from '@/lib/csv/write';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listAirways, listFixes } from '@/db/route-library';
import { AIRWAY_CSV_TEMPLATE, FIX_CSV_TEMPLATE } from '@/lib/imports/route-library-csv';
import { formatFlightPlanCoordinate } from '@/lib/screening';
import { Card, EmptyState } from '@/components/ui/card';
import { countOf, LibraryList, LibraryPage } from '@/components/library/library-page';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { formatNumber } from '@/lib/format';
import { RouteLibraryDeleteButton, RouteLibraryUploadForm } from '@/components/library/route-library-forms';

export const metadata = { title: 'Fixes & airways' };

const LIST_LIMIT = 500;

export default async function FixesPage({
  params,
  searchParams,
}: {
  params: Promise<{ slug: string }>;
  searchParams: Promise<{ q?: string | string[] }>;
}) {
  const [{ slug }, search] = await Promise.all([params, searchParams]);
  const { workspace, role } = await requireMember(slug, 'flights:read');
  const raw = typeof search.q === 'string' ? search.q.trim() : '';
  const tooLong = raw.length > 12;
  const q = tooLong ? '' : raw;
  const scope = { workspaceId: workspace.id };
  const [fixes, airways] = await Promise.all([
    listFixes(scope, { q, limit: LIST_LIMIT + 1 }),
    listAirways(scope, { q, limit: LIST_LIMIT }),
  ]);
  const canWrite = can(role, 'navdata:write');
  const api = `/api/v1/workspaces/${slug}`;
  return (
    <LibraryPage
      title="Fixes & airways"
      lead="This workspace's own named points and airways. A flight-plan route (ICAO item 15) looks its point names and airways up here; anything it cannot find is shown as not found, never dropped."
      above={
        <form method="get" className="mb-4 flex flex-wrap items-end gap-3">
          <Field id="q" label="Name starts with" error={tooLong ? 'Use at most 12 characters.' : undefined}>
            <TextInput id="q" name="q" defaultValue={raw} placeholder="QX" invalid={tooLong} />
          </Field>
          <Button type="submit" variant="secondary">
            Search
          </Button>
        </form>
      }
      canWrite={canWrite}
      forms={[
        {
          title: 'Upload fixes',
          body: <RouteLibraryUploadForm slug={slug} kind="fixes" templateHref={csvDataHref(FIX_CSV_TEMPLATE)} />,
        },
        {
          title: 'Upload airways',
          body: <RouteLibraryUploadForm slug={slug} kind="airways" templateHref={csvDataHref(AIRWAY_CSV_TEMPLATE)} />,
        },
      ]}
    >
      <LibraryList
        count={fixes.length}
        canWrite={canWrite}
        empty={{
          title: q ? `No fixes starting with ${q.toUpperCase()}` : 'No fixes yet',
          writers: 'Upload a CSV of named points with the form.',
          readers: 'A planner in this workspace can upload named points here.',
        }}
        title={fixes.length > LIST_LIMIT ? `First ${LIST_LIMIT} fixes` : countOf(fixes.length, 'fix', 'fixes')}
        columns={[
          { label: 'Name' },
          { label: 'Region' },
          { label: 'Latitude', right: true },
          { label: 'Longitude', right: true },
          { label: 'Item 15' },
          ...(canWrite ? [{ label: <span className="sr-only">Actions</span> }] : []),
        ]}
      >
        {fixes.slice(0, LIST_LIMIT).map((f) => (
          <tr key={f.id} className="border-t border-line">
            <td className="py-2 pr-3 font-medium">{f.name}</td>
            <td className="py-2 pr-3 text-ink-soft">{f.region || '—'}</td>
            <td className="figure py-2 pr-3 text-right">{formatNumber(f.lat, 4)}</td>
            <td className="figure py-2 pr-3 text-right">{formatNumber(f.lon, 4)}</td>
            <td className="py-2 pr-3 font-mono text-xs text-ink-soft">{formatFlightPlanCoordinate(f.lat, f.lon)}</td>
            {canWrite ? (
              <td className="py-2 text-right">
                <RouteLibraryDeleteButton url={`${api}/fixes/${f.id}`} name={f.name} />
              </td>
            ) : null}
          </tr>
        ))}
      </LibraryList>
      {airways.length === 0 ? (
        <EmptyState title={q ? `No airways starting with ${q.toUpperCase()}` : 'No airways yet'}>
          Without an airway here, a flight plan flies the airway as a great circle between its two points, and says so.
        </EmptyState>
      ) : (
        <Card title={countOf(airways.length, 'airway')}>
          <ul className="divide-y divide-line text-sm">
            {airways.map((a) => (
              <li key={a.id} className="flex items-start justify-between gap-3 py-2">
                <div className="min-w-0">
                  <span className="font-medium">{a.name}</span>{' '}
                  <span className="text-ink-soft">({a.fixes.length} points)</span>
                  <div className="break-words font-mono text-xs text-ink-soft">{a.fixes.join(' · ')}</div>
                </div>
                {canWrite ? <RouteLibraryDeleteButton url={`${api}/airways/${a.id}`} name={a.name} /> : null}
              </li>
            ))}
          </ul>
        </Card>
      )}
    </LibraryPage>
  );
}
