import Link from 'next/link';
import type { FlightDto } from '@/db/flights';
import type { UnitSystem } from '@/db/users';
import { formatDistance, formatMass, formatMassRange, formatPercent } from '@/lib/format';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { TableHead } from '@/components/ui/table-head';

function cruise(f: FlightDto): string {
  return f.cruiseFl === f.maxFl ? `FL${f.cruiseFl}` : `FL${f.cruiseFl}–${f.maxFl}`;
}

const num = 'px-2 py-2 text-right figure whitespace-nowrap';

/** One page of flights with their screening figures in the user's units; pending and failed flights say so. */
export function FlightsTable({
  flights,
  units,
  slug,
}: {
  flights: FlightDto[];
  units: UnitSystem;
  /** The workspace, so each flight links to its page. */
  slug?: string;
}) {
  return (
    <ScrollRegion label="Flights and their screening figures, scrollable">
      <table className="w-full text-sm">
        <caption className="sr-only">Flights and their screening figures</caption>
        <TableHead
          pad="px-2 py-2"
          gap=""
          rowClassName="border-b border-line"
          columns={[
            'Date',
            'Flight',
            'Route',
            'Aircraft · fleet',
            'Cruise',
            { label: 'Distance', right: true },
            { label: 'Fuel', right: true },
            { label: 'NOx', right: true },
            { label: 'NOx above', right: true },
            { label: 'Share above', right: true },
            { label: 'Ozone figure (range)', right: true },
          ]}
        />
        <tbody>
          {flights.map((f) => (
            <tr key={f.id} className="border-b border-line align-top last:border-0">
              <td className="whitespace-nowrap px-2 py-2">{f.date}</td>
              <td className="whitespace-nowrap px-2 py-2 font-medium">
                {slug ? (
                  <Link href={`/w/${slug}/flights/${f.id}`} className="text-accent hover:underline">
                    {f.flight}
                  </Link>
                ) : (
                  f.flight
                )}
                {f.basis === 'flown' ? (
                  <span className="block text-xs font-normal text-ink-faint">flown track</span>
                ) : null}
              </td>
              <td className="whitespace-nowrap px-2 py-2">
                {f.origin} → {f.destination}
              </td>
              <td className="whitespace-nowrap px-2 py-2">
                {f.aircraft}
                {f.fleet ? <span className="block text-xs text-ink-faint">{f.fleet}</span> : null}
              </td>
              <td className="whitespace-nowrap px-2 py-2">
                {cruise(f)}
                {f.cruiseFl !== f.maxFl ? <span className="block text-xs text-ink-faint">step climb</span> : null}
              </td>
              {f.status === 'screened' ? (
                <>
                  <td className={num}>{formatDistance(f.distanceKm ?? 0, units)}</td>
                  <td className={num}>
                    {formatMass(f.fuelKg, units)}
                    {f.fuelWarning ? (
                      <span className="block text-xs font-medium text-caution" title={f.fuelWarning}>
                        unusual for the distance<span className="sr-only">: {f.fuelWarning}</span>
                      </span>
                    ) : null}
                  </td>
                  <td className={num}>{formatMass(f.noxTotalKg ?? 0, units)}</td>
                  <td className={`${num} text-strato-strong`}>{formatMass(f.noxAboveTropopauseKg ?? 0, units)}</td>
                  <td className={`${num} text-strato-strong`}>{formatPercent(f.fractionAboveTropopause ?? 0, 0)}</td>
                  <td className={num}>
                    {formatMass(f.ozoneLoss?.centralKg ?? 0, units)}
                    <span className="block text-xs text-ink-faint">
                      {formatMassRange(f.ozoneLoss?.lowKg ?? 0, f.ozoneLoss?.highKg ?? 0, units, '–')}
                    </span>
                  </td>
                </>
              ) : (
                <>
                  <td className={num}>–</td>
                  <td className={num}>{formatMass(f.fuelKg, units)}</td>
                  <td
                    colSpan={4}
                    className={`px-2 py-2 text-xs ${f.status === 'failed' ? 'text-danger' : 'text-ink-soft'}`}
                  >
                    {f.status === 'failed'
                      ? `Not screened: ${f.failureReason ?? 'the engine refused this flight'}`
                      : 'Waiting to be screened…'}
                  </td>
                </>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollRegion>
  );
}
