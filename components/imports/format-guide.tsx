import { IMPORT_LIMITS, SCHEDULE_COLUMN_DOCS } from '@/lib/validation/imports';

/** The schedule format as the imports page documents it: columns, units, limits and an example. */
export function FormatGuide({ example, templateHref }: { example: string; templateHref: string }) {
  return (
    <div className="space-y-4 text-sm">
      <p className="text-ink-soft">
        CSV, UTF-8 (a byte-order mark is fine), comma-separated, one flight per row after a header row. Header names are not case
        sensitive; columns may come in any order. At most {IMPORT_LIMITS.maxRows.toLocaleString('en-GB')} flights and{' '}
        {IMPORT_LIMITS.maxBytes / (1024 * 1024)} MB per file.
      </p>
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Columns of a schedule file</caption>
          <thead className="text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th scope="col" className="py-1.5 pr-3">Column</th>
              <th scope="col" className="py-1.5 pr-3">Unit or form</th>
              <th scope="col" className="py-1.5">Meaning</th>
            </tr>
          </thead>
          <tbody>
            {SCHEDULE_COLUMN_DOCS.map((c) => (
              <tr key={c.name} className="border-t border-line align-top">
                <td className="py-1.5 pr-3">
                  <code className="font-mono text-xs">{c.name}</code>
                  <span className={`ml-1 text-xs ${c.required ? 'text-ink' : 'text-ink-faint'}`}>{c.required ? 'required' : 'optional'}</span>
                </td>
                <td className="py-1.5 pr-3 text-ink-soft">{c.unit}</td>
                <td className="py-1.5">
                  {c.description} <span className="text-ink-faint">e.g. </span>
                  <code className="font-mono text-xs">{c.example}</code>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <ul className="list-disc space-y-1 pl-5 text-ink-soft">
        <li>Line numbers in problems count the header as line 1.</li>
        <li>Columns we do not know are listed and ignored; the file is still accepted.</li>
        <li>A flight already in the workspace (same date, flight, origin and destination), or twice in the file, is refused: nothing is imported or billed twice.</li>
        <li>The route is the great circle between the two airports; fuel_kg is the cruise fuel along it.</li>
      </ul>
      <div>
        <p className="mb-1 font-medium text-ink">Example</p>
        <pre className="overflow-x-auto rounded-md border border-line bg-paper-sunk p-3 font-mono text-xs leading-relaxed">{example}</pre>
      </div>
      <a href={templateHref} download className="inline-flex items-center gap-2 rounded-md border border-line-strong bg-paper-raised px-3.5 py-2 text-sm font-medium text-ink hover:bg-paper-sunk">
        Download the template (CSV)
      </a>
    </div>
  );
}
