export interface CsvProblemView {
  line: number;
  column: string;
  message: string;
}

/** Problems (or ignored-column notes) of an uploaded CSV, by line and column, as a spreadsheet shows them. */
export function ProblemsTable({ problems, caption }: { problems: readonly CsvProblemView[]; caption: string }) {
  return (
    <div className="max-h-72 overflow-auto rounded-md border border-line">
      <table className="w-full text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="sticky top-0 bg-paper-sunk text-left text-xs uppercase tracking-wide text-ink-soft">
          <tr>
            <th scope="col" className="px-3 py-1.5">
              Line
            </th>
            <th scope="col" className="px-3 py-1.5">
              Column
            </th>
            <th scope="col" className="px-3 py-1.5">
              Problem
            </th>
          </tr>
        </thead>
        <tbody>
          {problems.map((p, i) => (
            <tr key={i} className="border-t border-line align-top">
              <td className="figure px-3 py-1.5">{p.line}</td>
              <td className="px-3 py-1.5 font-mono text-xs">{p.column || '—'}</td>
              <td className="px-3 py-1.5">{p.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
