/**
 * The one CSV writer, per RFC 4180: CRLF line ends, a field is quoted when it holds a comma, a quote,
 * CR or LF (or starts or ends with a space), quotes inside are doubled. Text cells that a spreadsheet
 * would run as a formula (starting with = + - @, a tab or CR) get a leading apostrophe (OWASP "CSV
 * injection"). Numbers are written plainly and never altered; booleans as yes / no.
 */
export type CsvCell = string | number | boolean | null;

const FORMULA_START = /^[=+\-@\t\r]/;

export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

function numberText(n: number): string {
  if (!Number.isFinite(n)) return '';
  // Up to 12 significant digits, without the binary noise of the last places.
  return Number.isInteger(n) ? String(n) : String(Number(n.toPrecision(12)));
}

export function csvField(cell: CsvCell): string {
  if (cell === null) return '';
  if (typeof cell === 'boolean') return cell ? 'yes' : 'no';
  const text = typeof cell === 'number' ? numberText(cell) : neutraliseFormula(cell);
  return /[",\r\n]|^ | $/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Records as CSV text, each ending in CRLF. With `width`, shorter records are padded with empty fields
 * so every record has the same number of fields (RFC 4180 s.2.4).
 */
export function csvRecords(rows: readonly (readonly CsvCell[])[], width = 0): string {
  return (
    rows
      .map((row) => [...row, ...Array<CsvCell>(Math.max(0, width - row.length)).fill(null)].map(csvField).join(','))
      .join('\r\n') + '\r\n'
  );
}

/** A header record and data records. */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return csvRecords([header, ...rows]);
}

/** A CSV as a `data:` link, for a template the browser downloads without a request. */
export function csvDataHref(csv: string): string {
  return `data:text/csv;charset=utf-8,${encodeURIComponent(csv)}`;
}
