/**
 * CSV per RFC 4180: CRLF line ends, a field is quoted when it holds a comma, a quote, CR or LF (or
 * starts or ends with a space), quotes inside are doubled. Text cells that a spreadsheet would run
 * as a formula (starting with = + - @, a tab or CR) get a leading apostrophe (OWASP "CSV injection").
 * Numbers are written plainly and never altered.
 */
export type CsvCell = string | number | null;

const FORMULA_START = /^[=+\-@\t\r]/;

export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

function numberText(n: number): string {
  if (!Number.isFinite(n)) return '';
  // Up to 6 significant decimals without exponent noise for the figures we export.
  return Number.isInteger(n) ? String(n) : String(Number(n.toPrecision(12)));
}

export function csvField(cell: CsvCell): string {
  if (cell === null) return '';
  const text = typeof cell === 'number' ? numberText(cell) : neutraliseFormula(cell);
  return /[",\r\n]|^ | $/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return [header, ...rows].map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}
