import { TRACK_COLUMN_DOCS, TRACK_IMPORT_LIMITS } from '@/lib/validation/track-import';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { TableHead } from '@/components/ui/table-head';

const MB = 1024 * 1024;

/** The flown-track format: every column with its unit and meaning, the rules, the template and an example. */
export function TrackFormatGuide({ templateHref, example }: { templateHref: string; example: string }) {
  return (
    <div className="space-y-4 text-sm">
      <p className="text-ink-soft">
        CSV, UTF-8, comma-separated, one point per row after a header row; many flights in one file. The points of a
        flight are in time order (a time earlier than the one before is taken as past midnight). Up to{' '}
        {TRACK_IMPORT_LIMITS.maxPoints.toLocaleString('en-GB')} points,{' '}
        {TRACK_IMPORT_LIMITS.maxFlights.toLocaleString('en-GB')} flights and {TRACK_IMPORT_LIMITS.maxBytes / MB} MB per
        file; 2 to 20 000 points a flight. Any problem refuses the whole file, listed by line and column.
      </p>
      <ScrollRegion label="Columns of a track file">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Columns of a track file</caption>
          <TableHead
            className="text-xs uppercase tracking-wide text-ink-soft"
            pad="py-1.5"
            columns={['Column', 'Required', 'Unit', 'Meaning', 'Example']}
          />
          <tbody>
            {TRACK_COLUMN_DOCS.map((c) => (
              <tr key={c.name} className="border-t border-line align-top">
                <td className="py-1.5 pr-3 font-mono text-xs">{c.name}</td>
                <td className="py-1.5 pr-3">{c.required}</td>
                <td className="py-1.5 pr-3 text-ink-soft">{c.unit}</td>
                <td className="py-1.5 pr-3">{c.description}</td>
                <td className="whitespace-nowrap py-1.5 font-mono text-xs">{c.example}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      <p className="text-ink-soft">
        A track shares a flight with a planned (schedule) flight when flight, date, origin and destination match; that
        flight&apos;s page then shows planned and flown side by side. Screening estimates, not a certified inventory.
      </p>
      <a
        href={templateHref}
        download
        className="inline-flex items-center gap-2 rounded-md border border-line-strong bg-paper-raised px-3.5 py-2 text-sm font-medium text-ink hover:bg-paper-sunk"
      >
        Download the track template (CSV)
      </a>
      <details>
        <summary className="cursor-pointer text-ink-soft">Example file</summary>
        <ScrollRegion label="Example track file">
          <pre className="mt-2 overflow-x-auto rounded-md bg-paper-sunk p-3 font-mono text-xs">{example}</pre>
        </ScrollRegion>
      </details>
    </div>
  );
}
