import { notFound } from 'next/navigation';
import { isAppError, requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { getSounding } from '@/db/soundings';
import { isa, ISA_MAX_ALTITUDE_M } from '@/lib/screening';
import { completeSounding } from '@/lib/screening/tropopause';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { formatAltitude, formatDateTime, formatNumber } from '@/lib/format';
import { SoundingChart, type ProfilePoint } from '@/components/charts/sounding-chart';
import { DeleteButton } from '@/components/ui/delete-button';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { flightLevelAtPressure } from '@/components/library/format';
import { deleteSoundingAction } from '../actions';

export const metadata = { title: 'Sounding' };

interface TableRow extends ProfilePoint {
  altitudeGiven: boolean;
  pressureGiven: boolean;
}

export default async function SoundingPage({ params }: { params: Promise<{ slug: string; id: string }> }) {
  const { slug, id: rawId } = await params;
  const { workspace, user, role } = await requireMember(slug, 'flights:read');
  if (!/^\d{1,12}$/.test(rawId)) notFound();
  const sounding = await getSounding({ workspaceId: workspace.id }, Number(rawId)).catch((err: unknown) => {
    if (isAppError(err) && err.status === 404) notFound();
    throw err;
  });
  const profile = completeSounding(sounding.levels, 'levels');
  // completeSounding sorts by altitude and keeps given values exactly, so each row is matched to the level it came from.
  const rows: TableRow[] = Array.from(profile.altitudeM, (z, k) => {
    const p = profile.pressurePa[k];
    const t = profile.temperatureK[k];
    const source = sounding.levels.find(
      (l) => l.temperatureK === t && (l.altitudeM === z || (l.pressureHpa !== undefined && l.pressureHpa * 100 === p)),
    );
    return {
      altitudeM: z,
      pressureHpa: p / 100,
      temperatureK: t,
      altitudeGiven: source?.altitudeM !== undefined,
      pressureGiven: source?.pressureHpa !== undefined,
    };
  });
  const top = Math.min(Math.max(rows[rows.length - 1].altitudeM, 1000), ISA_MAX_ALTITUDE_M);
  const bottom = Math.max(Math.min(rows[0].altitudeM, 0), -500);
  const isaPoints: ProfilePoint[] = Array.from({ length: 41 }, (_, i) => {
    const z = bottom + ((top - bottom) * i) / 40;
    const s = isa(z);
    return { altitudeM: z, pressureHpa: s.pressurePa / 100, temperatureK: s.temperatureK };
  });
  const tp = sounding.tropopause;
  const tpFl = tp ? flightLevelAtPressure(tp.pressureHpa) : null;
  const canWrite = can(role, 'library:write');
  const isaDeviation = (r: ProfilePoint) => {
    const d =
      Math.round((r.temperatureK - isa(Math.min(Math.max(r.altitudeM, -500), ISA_MAX_ALTITUDE_M)).temperatureK) * 10) /
      10;
    return d === 0 ? '0.0 K' : `${d > 0 ? '+' : '−'}${formatNumber(Math.abs(d), 1)} K`;
  };
  return (
    <>
      <PageHeader
        title={sounding.name}
        lead={
          [sounding.station, sounding.observedAt ? `observed ${formatDateTime(sounding.observedAt)}` : '']
            .filter(Boolean)
            .join(', ') || undefined
        }
        actions={
          can(role, 'screenings:create') ? (
            <ButtonLink href={`/w/${slug}/screen?sounding=${sounding.id}`}>Use in a screening</ButtonLink>
          ) : undefined
        }
      />
      <div className="mb-6 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {tp ? (
          <>
            <Stat
              label="WMO tropopause"
              tone="strato"
              value={formatAltitude(tp.altitudeM, user.units)}
              sub={tpFl ? `about ${tpFl} by pressure` : undefined}
            />
            <Stat label="Tropopause pressure" value={`${formatNumber(tp.pressureHpa, 1)} hPa`} />
            <Stat
              label="Tropopause temperature"
              value={`${formatNumber(tp.temperatureK - 273.15, 1)} °C`}
              sub={`${formatNumber(tp.temperatureK, 1)} K`}
            />
          </>
        ) : (
          <div className="sm:col-span-2 lg:col-span-3">
            <Notice tone="caution" title="No tropopause found in this sounding">
              No level above 500 hPa meets the WMO (1957) lapse-rate definition: within this sounding the temperature
              keeps falling faster than 2 K/km. It may end too low to reach the tropopause. A screening given this
              sounding uses the climatological tropopause instead, and says so in its cautions.
            </Notice>
          </div>
        )}
        <Stat
          label="Levels"
          value={rows.length}
          sub={`up to ${formatAltitude(rows[rows.length - 1].altitudeM, user.units)}`}
        />
      </div>
      <Card title="Temperature profile" className="mb-6">
        <SoundingChart
          levels={rows.map(({ altitudeM, pressureHpa, temperatureK }) => ({ altitudeM, pressureHpa, temperatureK }))}
          isa={isaPoints}
          tropopause={tp}
          units={user.units}
        />
        <p className="mt-3 text-xs text-ink-soft">
          The tropopause is the WMO (1957) lapse-rate tropopause: the lowest level above 500 hPa where the temperature
          falls by 2 K/km or less, and on average no faster over the 2 km above. Altitudes are geopotential; a flight
          level is compared by pressure. Dotted: the ICAO standard atmosphere.
        </p>
      </Card>
      <div
        className={canWrite ? 'grid grid-cols-1 items-start gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(16rem,1fr)]' : ''}
      >
        <Card title="Levels">
          <ScrollRegion label="Sounding levels" className="max-h-[32rem] overflow-auto">
            <table className="w-full text-sm">
              <thead className="sticky top-0 bg-paper-raised text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th scope="col" className="py-2 pr-3 text-right">
                    Altitude
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right">
                    Pressure, hPa
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right">
                    Temperature
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right">
                    ISA deviation
                  </th>
                  <th scope="col" className="py-2" />
                </tr>
              </thead>
              <tbody>
                {[...rows].reverse().map((r, i) => {
                  const isTp = tp !== null && Math.abs(r.altitudeM - tp.altitudeM) < 0.5;
                  const above = tp !== null && r.altitudeM > tp.altitudeM + 0.5;
                  return (
                    <tr
                      key={i}
                      className={`border-t border-line ${isTp ? 'bg-caution-soft' : above ? 'bg-strato-soft/40' : ''}`}
                    >
                      <td className="figure py-1 pr-3 text-right">
                        {formatAltitude(r.altitudeM, user.units)}
                        {r.altitudeGiven ? null : (
                          <span className="ml-1 text-ink-faint" title="Computed from pressure (hypsometric equation)">
                            *
                          </span>
                        )}
                      </td>
                      <td className="figure py-1 pr-3 text-right">
                        {formatNumber(r.pressureHpa, 1)}
                        {r.pressureGiven ? null : (
                          <span className="ml-1 text-ink-faint" title="Computed from altitude">
                            *
                          </span>
                        )}
                      </td>
                      <td className="figure py-1 pr-3 text-right whitespace-nowrap">
                        {formatNumber(r.temperatureK - 273.15, 1)} °C{' '}
                        <span className="text-ink-faint">({formatNumber(r.temperatureK, 1)} K)</span>
                      </td>
                      <td className="figure py-1 pr-3 text-right">{isaDeviation(r)}</td>
                      <td className="py-1 text-xs font-medium text-caution">{isTp ? 'tropopause' : ''}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </ScrollRegion>
          <p className="mt-2 text-xs text-ink-faint">
            * computed: altitudes from pressure by the hypsometric equation, pressures from altitude.
          </p>
        </Card>
        {canWrite ? (
          <Card title="Delete">
            <p className="mb-3 text-sm text-ink-soft">
              Screenings that used this sounding keep their own copy of its levels.
            </p>
            <DeleteButton
              action={deleteSoundingAction.bind(null, slug, sounding.id)}
              confirmText={`Delete the sounding “${sounding.name}”?`}
              label="Delete sounding"
              after={`/w/${slug}/soundings`}
            />
          </Card>
        ) : null}
      </div>
    </>
  );
}
