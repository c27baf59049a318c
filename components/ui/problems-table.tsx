import type { LineProblem } from '@/lib/validation/problems';
import { ScrollRegion } from '@/components/ui/scroll-region';

/**
 * Problems (or notes) of an uploaded file by line and column, as a spreadsheet shows them (line 1 is
 * the header; line 0 is the file as a whole). `total` says how many there were when only the first
 * ones came back.
 */
export function ProblemsTable({
  problems,
  caption,
  total,
  heading = 'What to fix',
}: {
  problems: readonly LineProblem[];
  caption: string;
  total?: number;
  heading?: string;
}) {
  return (
    <div>
      <ScrollRegion label={caption} className="max-h-80 overflow-y-auto rounded-md border border-line">
        <table className="w-full text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead className="sticky top-0 bg-paper-sunk text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th scope="col" className="w-16 px-3 py-1.5">
                Line
              </th>
              <th scope="col" className="w-40 px-3 py-1.5">
                Column
              </th>
              <th scope="col" className="px-3 py-1.5">
                {heading}
              </th>
            </tr>
          </thead>
          <tbody>
            {problems.map((p, i) => (
              <tr key={`${p.line}-${p.column}-${i}`} className="border-t border-line align-top">
                <td className="figure px-3 py-1.5">{p.line === 0 ? 'file' : p.line}</td>
                <td className="px-3 py-1.5 font-mono text-xs">{p.column || '—'}</td>
                <td className="px-3 py-1.5">{p.message}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      {total !== undefined && total > problems.length ? (
        <p className="mt-1 text-xs text-ink-soft">
          Showing the first {problems.length} of {total} problems; fix these and upload again to see the rest.
        </p>
      ) : null}
    </div>
  );
}
