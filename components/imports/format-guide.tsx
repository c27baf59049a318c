import { IMPORT_LIMITS, SCHEDULE_COLUMN_DOCS } from '@/lib/validation/imports';
import { ScrollRegion } from '@/components/ui/scroll-region';

const MB = 1024 * 1024;

/** Beside the upload: which columns a file needs, its limits and the template. */
export function FormatSummary({ templateHref }: { templateHref: string }) {
  const required = SCHEDULE_COLUMN_DOCS.filter((c) => c.required);
  const optional = SCHEDULE_COLUMN_DOCS.filter((c) => !c.required);
  return (
    <div className="space-y-3 text-sm">
      <p>
        <span className="font-medium text-ink">Required columns: </span>
        {required.map((c, i) => (
          <span key={c.name}>
            <code className="font-mono text-xs">{c.name}</code>
            {i < required.length - 1 ? ', ' : ''}
          </span>
        ))}
        .
      </p>
      <p>
        <span className="font-medium text-ink">Optional: </span>
        {optional.map((c, i) => (
          <span key={c.name}>
            <code className="font-mono text-xs">{c.name}</code>
            {i < optional.length - 1 ? ', ' : ''}
          </span>
        ))}
        .
      </p>
      <p className="text-ink-soft">
        CSV in UTF-8 with a header row, up to {IMPORT_LIMITS.maxRows.toLocaleString('en-GB')} flights and{' '}
        {IMPORT_LIMITS.maxBytes / MB} MB per file. Units and examples are in the{' '}
        <a href="#format" className="text-accent underline underline-offset-2">
          column reference
        </a>{' '}
        below.
      </p>
      <a
        href={templateHref}
        download
        className="inline-flex items-center gap-2 rounded-md border border-line-strong bg-paper-raised px-3.5 py-2 text-sm font-medium text-ink hover:bg-paper-sunk"
      >
        Download the template (CSV)
      </a>
    </div>
  );
}

/** The full schedule format: every column with its unit and meaning, the rules, and an example. */
export function FormatReference({ example }: { example: string }) {
  return (
    <div className="space-y-4 text-sm">
      <p className="text-ink-soft">
        CSV, UTF-8 (a byte-order mark is fine), comma-separated, one flight per row after a header row. Header names are
        not case sensitive and columns may come in any order.
      </p>
      <ScrollRegion label="Columns of a schedule file">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Columns of a schedule file</caption>
          <thead className="text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th scope="col" className="py-1.5 pr-4">
                Column
              </th>
              <th scope="col" className="py-1.5 pr-4">
                Unit or form
              </th>
              <th scope="col" className="py-1.5 pr-4">
                Meaning
              </th>
              <th scope="col" className="hidden py-1.5 lg:table-cell">
                Example
              </th>
            </tr>
          </thead>
          <tbody>
            {SCHEDULE_COLUMN_DOCS.map((c) => (
              <tr key={c.name} className="border-t border-line align-top">
                <td className="whitespace-nowrap py-1.5 pr-4">
                  <code className="font-mono text-xs">{c.name}</code>
                  <span className={`block text-xs lg:ml-1.5 lg:inline ${c.required ? 'text-ink' : 'text-ink-faint'}`}>
                    {c.required ? 'required' : 'optional'}
                  </span>
                </td>
                <td className="py-1.5 pr-4 text-ink-soft">{c.unit}</td>
                <td className="py-1.5 pr-4">
                  {c.description}
                  <span className="mt-0.5 block lg:hidden">
                    <span className="text-ink-faint">e.g. </span>
                    <code className="font-mono text-xs">
                      {/* Wraps between words only: a date such as 2026-11-03 never breaks at its hyphens. */}
                      {c.example.split(' ').map((word, k) => (
                        <span key={k}>
                          {k ? ' ' : ''}
                          <span className="whitespace-nowrap">{word}</span>
                        </span>
                      ))}
                    </code>
                  </span>
                </td>
                <td className="hidden py-1.5 lg:table-cell">
                  <code className="whitespace-nowrap font-mono text-xs">{c.example}</code>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      <ul className="list-disc space-y-1 pl-5 text-ink-soft">
        <li>Line numbers in problems count the header as line 1.</li>
        <li>Columns we do not know are listed and ignored; the file is still accepted.</li>
        <li>
          A flight already in the workspace (same date, flight, origin and destination), or twice in the file, is
          refused: nothing is imported or billed twice.
        </li>
        <li>
          The route is the great circle between the two airports; fuel_kg is the cruise fuel along it, not the LTO
          cycle.
        </li>
        <li>
          One problem refuses the whole file, so a schedule is never half imported. Fix the rows listed and upload the
          file again.
        </li>
      </ul>
      <div className="min-w-0">
        <p className="mb-1 font-medium text-ink">Example</p>
        <ScrollRegion label="Example schedule" className="rounded-md border border-line bg-paper-sunk">
          <pre className="whitespace-pre p-3 font-mono text-xs leading-relaxed">{example}</pre>
        </ScrollRegion>
      </div>
    </div>
  );
}
