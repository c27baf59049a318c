import Link from 'next/link';
import type { UnitSystem } from '@/db/users';
import { formatMass, formatNumber } from '@/lib/format';
import type { PeriodView } from '@/lib/periods/service';
import { Card } from '@/components/ui/card';
import { ScrollRegion } from '@/components/ui/scroll-region';

type Change = PeriodView['changesAfterFreeze'][number];

const CHANGE_LABELS: Record<Change['kind'], string> = {
  added: 'Imported',
  rescreened: 'Screened again',
  removed: 'Removed',
};

/** The flights of a frozen period imported, screened again or removed since: not in its figures. */
export function ChangesAfterSignOffCard({
  slug,
  changes,
  units,
}: {
  slug: string;
  changes: Change[];
  units: UnitSystem;
}) {
  return (
    <Card title={`After sign-off (${changes.length})`} className="mt-6">
      {changes.length ? (
        <>
          <p className="mb-3 text-sm text-ink-soft">
            Flights dated in this period that were imported, screened again or removed after it was frozen. They are not
            in its figures until the period is reopened and moved to review again.
          </p>
          <ScrollRegion label="Changes after sign-off">
            <table className="w-full text-sm" data-testid="after-sign-off">
              <caption className="sr-only">Changes after the period was frozen</caption>
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th className="py-2 pr-3">Change</th>
                  <th className="py-2 pr-3">Date</th>
                  <th className="py-2 pr-3">Flight</th>
                  <th className="py-2 pr-3">Route</th>
                  <th className="py-2 pl-3 text-right">NOx above now</th>
                  <th className="py-2 pl-3 text-right">Frozen</th>
                </tr>
              </thead>
              <tbody>
                {changes.map((c) => (
                  <tr key={`${c.kind}:${c.flightId}`} className="border-t border-line">
                    <td className="py-1.5 pr-3">{CHANGE_LABELS[c.kind]}</td>
                    <td className="figure py-1.5 pr-3">{c.date}</td>
                    <td className="py-1.5 pr-3">
                      {c.kind === 'removed' ? (
                        c.flight
                      ) : (
                        <Link
                          prefetch={false}
                          href={`/w/${slug}/flights/${c.flightId}`}
                          className="text-accent underline-offset-2 hover:underline"
                        >
                          {c.flight}
                        </Link>
                      )}
                    </td>
                    <td className="py-1.5 pr-3">
                      {c.origin}–{c.destination}
                    </td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                      {c.noxAboveKgNow === null ? '–' : formatMass(c.noxAboveKgNow, units)}
                    </td>
                    <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                      {c.noxAboveKgFrozen === null ? '–' : formatMass(c.noxAboveKgFrozen, units)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </>
      ) : (
        <p className="text-sm text-ink-soft">Nothing has changed since the figures were frozen.</p>
      )}
    </Card>
  );
}

/** The first of the flights in a frozen period's figures; every one is in the audit CSV. */
export function FrozenFlightsCard({
  slug,
  view,
  units,
}: {
  slug: string;
  view: Pick<PeriodView, 'snapshot' | 'frozenFlights'>;
  units: UnitSystem;
}) {
  const total = view.snapshot?.flights ?? 0;
  return (
    <Card title={`Frozen flights (${formatNumber(total)})`} className="mt-6">
      <ScrollRegion label="Frozen flights">
        <table className="w-full text-sm">
          <caption className="sr-only">The flights in the frozen figures</caption>
          <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="py-2 pr-3">Date</th>
              <th className="py-2 pr-3">Flight</th>
              <th className="py-2 pr-3">Route</th>
              <th className="py-2 pr-3">Aircraft</th>
              <th className="py-2 pr-3">Fleet</th>
              <th className="py-2 pl-3 text-right">NOx above tropopause</th>
              <th className="py-2 pl-3">Engine</th>
              <th className="py-2 pl-3 text-right">Import</th>
            </tr>
          </thead>
          <tbody>
            {view.frozenFlights.map((f) => (
              <tr key={f.flightId} className="border-t border-line">
                <td className="figure py-1.5 pr-3">{f.date}</td>
                <td className="py-1.5 pr-3">
                  <Link
                    prefetch={false}
                    href={`/w/${slug}/flights/${f.flightId}`}
                    className="text-accent underline-offset-2 hover:underline"
                  >
                    {f.flight}
                  </Link>
                </td>
                <td className="py-1.5 pr-3">
                  {f.origin}–{f.destination}
                </td>
                <td className="py-1.5 pr-3">{f.aircraftCode}</td>
                <td className="py-1.5 pr-3">{f.fleetName ?? 'No fleet'}</td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{formatMass(f.noxAboveKg, units)}</td>
                <td className="py-1.5 pl-3 text-xs">{f.engineVersion}</td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{f.importId ?? '–'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      {total > view.frozenFlights.length ? (
        <p className="mt-2 text-xs text-ink-faint">
          The first {formatNumber(view.frozenFlights.length)} shown; every flight is in the audit CSV.
        </p>
      ) : null}
    </Card>
  );
}
