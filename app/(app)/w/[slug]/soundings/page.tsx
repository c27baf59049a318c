import { csvDataHref } from '@/lib/csv/write';
import { listSoundings } from '@/db/soundings';
import { soundingCsvTemplate } from '@/lib/imports/soundings-csv';
import { formatAltitude, formatDateTime, formatNumber } from '@/lib/format';
import { Tag } from '@/components/library/badges';
import { flightLevelAtPressure } from '@/components/library/format';
import { libraryMember, LibraryList, LibraryPage, NameCell } from '@/components/library/library-page';
import { SoundingUploadForm } from '@/components/library/sounding-upload-form';

export const metadata = { title: 'Soundings' };

export default async function SoundingsPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug, workspace, user, canWrite } = await libraryMember(params, 'flights:read');
  const soundings = await listSoundings({ workspaceId: workspace.id });
  const templateHref = csvDataHref(soundingCsvTemplate());
  return (
    <LibraryPage
      title="Soundings"
      lead="Temperature profiles from radiosondes or model output. Each one's WMO lapse-rate tropopause is found on upload; use it in a screening instead of the climatology."
      canWrite={canWrite}
      forms={[{ title: 'Upload a sounding', body: <SoundingUploadForm slug={slug} templateHref={templateHref} /> }]}
    >
      <LibraryList
        count={soundings.length}
        noun="sounding"
        canWrite={canWrite}
        empty={EMPTY}
        columns={[
          { label: 'Sounding' },
          { label: 'Observed' },
          { label: 'Levels', right: true },
          { label: 'WMO tropopause' },
        ]}
      >
        {soundings.map((s) => (
          <tr key={s.id} className="border-t border-line align-top">
            <NameCell href={`/w/${slug}/soundings/${s.id}`} name={s.name}>
              {s.station ? <div className="text-xs text-ink-soft">{s.station}</div> : null}
            </NameCell>
            <td className="py-2 pr-3 whitespace-nowrap text-ink-soft">
              {s.observedAt ? formatDateTime(s.observedAt) : '—'}
            </td>
            <td className="figure py-2 pr-3 text-right">{s.levels.length}</td>
            <td className="py-2">
              {s.tropopause ? (
                <span className="figure">
                  {formatAltitude(s.tropopause.altitudeM, user.units)}
                  <span className="text-ink-soft">
                    {' '}
                    · {formatNumber(s.tropopause.pressureHpa, 0)} hPa
                    {flightLevelAtPressure(s.tropopause.pressureHpa)
                      ? ` (≈ ${flightLevelAtPressure(s.tropopause.pressureHpa)})`
                      : ''}{' '}
                    · {formatNumber(s.tropopause.temperatureK - 273.15, 1)} °C
                  </span>
                </span>
              ) : (
                <Tag tone="caution">None found</Tag>
              )}
            </td>
          </tr>
        ))}
      </LibraryList>
    </LibraryPage>
  );
}

const EMPTY = {
  title: 'No soundings yet',
  writers:
    'Upload a CSV of levels with the form: altitude or pressure, and temperature. You will see its temperature profile and the tropopause found in it.',
  readers: 'A planner in this workspace can upload soundings here.',
};
