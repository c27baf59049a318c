import Papa from 'papaparse';
import type { LineProblem } from '@/lib/validation/problems';

/**
 * A small, generic CSV reader for the product's imports (the documented import format): UTF-8 with or
 * without a BOM, comma-separated, a header row, header names case-insensitive and trimmed, CRLF or
 * LF line ends, quoted values (which may span lines). It only reads the table; each import checks
 * its own values.
 *
 * Line numbers count the header as line 1 and are physical lines of the file, so a quoted value
 * spanning lines moves the rows after it down, as a spreadsheet or text editor would show them.
 */

/** One problem with one place in a CSV: `line` (header = 1), `column` (a header name, or '' for the whole line). */
export type CsvProblem = LineProblem;

/** A column the import knows; `name` is lower-case, as written in the header (snake_case). */
export interface CsvColumnSpec {
  name: string;
  required?: boolean;
}

/** A data row: its line number and its values by (lower-case) column name, trimmed. Unknown columns are left out. */
export interface CsvRow {
  line: number;
  values: Record<string, string>;
}

export interface CsvTable {
  /** The line the header was found on (1 unless the file starts with blank lines); null for an empty file. */
  headerLine: number | null;
  /** Known columns present in the header, lower-case, in file order. */
  columns: string[];
  rows: CsvRow[];
  /** Problems that make the file unusable as it stands (missing columns, ragged or broken lines, too many rows). */
  problems: CsvProblem[];
  /** Notes that do not block the import: unknown columns, which are ignored. */
  warnings: CsvProblem[];
}

export interface ParseCsvOptions {
  columns: readonly CsvColumnSpec[];
  /** Most data rows accepted; the first row beyond it is a problem and reading stops. */
  maxRows?: number;
}

/** Reads a CSV text into rows keyed by column name, with problems and warnings by line and column. */
export function parseCsv(input: string, options: ParseCsvOptions): CsvTable {
  const text = input.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const known = new Map(options.columns.map((c) => [c.name.toLowerCase(), c]));
  const problems: CsvProblem[] = [];
  const warnings: CsvProblem[] = [];
  const rows: CsvRow[] = [];
  let header: (string | null)[] | null = null;
  let headerWidth = 0;
  let headerLine: number | null = null;
  const columns: string[] = [];

  let scanned = 0;
  let newlines = 0;
  const lineAt = (offset: number): number => {
    for (; scanned < offset && scanned < text.length; scanned++) if (text.charCodeAt(scanned) === 10) newlines++;
    return newlines + 1;
  };

  let start = 0;
  let stopped = false;
  Papa.parse<string[]>(text, {
    delimiter: ',',
    newline: '\n',
    quoteChar: '"',
    skipEmptyLines: false,
    step: (result, parser) => {
      const line = lineAt(start);
      const cursor = result.meta.cursor;
      start = cursor + 1;
      if (stopped) return;
      const cells = result.data;
      for (const e of result.errors) {
        problems.push({
          line,
          column: '',
          message:
            e.type === 'Quotes'
              ? 'A quoted value on this line is not closed (a " is missing).'
              : `This line cannot be read: ${e.message}.`,
        });
      }
      if (cells.every((c) => c.trim() === '')) return;
      if (!header) {
        headerWidth = cells.length;
        headerLine = line;
        const seen = new Set<string>();
        header = cells.map((raw, i) => {
          const name = raw.trim().toLowerCase();
          if (!name) {
            warnings.push({
              line,
              column: `(column ${i + 1})`,
              message: `Column ${i + 1} has no name in the header and was ignored.`,
            });
            return null;
          }
          if (!known.has(name)) {
            warnings.push({
              line,
              column: name,
              message: `The column "${raw.trim()}" is not one this import reads; it was ignored.`,
            });
            return null;
          }
          if (seen.has(name)) {
            problems.push({ line, column: name, message: `The column "${name}" appears twice in the header.` });
            return null;
          }
          seen.add(name);
          columns.push(name);
          return name;
        });
        for (const spec of options.columns) {
          if (spec.required && !seen.has(spec.name.toLowerCase())) {
            problems.push({ line, column: spec.name, message: `The header has no "${spec.name}" column.` });
          }
        }
        return;
      }
      if (options.maxRows !== undefined && rows.length >= options.maxRows) {
        problems.push({
          line,
          column: '',
          message: `A file may have at most ${options.maxRows} rows; this one has more. Split it and import the parts.`,
        });
        stopped = true;
        parser.abort();
        return;
      }
      if (cells.length !== headerWidth) {
        problems.push({
          line,
          column: '',
          message: `This line has ${cells.length} value${cells.length === 1 ? '' : 's'}; the header has ${headerWidth}. Check for a missing or extra comma.`,
        });
        return;
      }
      const values: Record<string, string> = {};
      header.forEach((name, i) => {
        if (name) values[name] = (cells[i] ?? '').trim();
      });
      rows.push({ line, values });
    },
  });
  if (!header)
    problems.push({ line: 1, column: '', message: 'The file is empty: its first line must be the header row.' });
  return { headerLine, columns, rows, problems, warnings };
}

/**
 * A number cell: `null` when empty, `NaN` when it is not a plain decimal number (a comma as decimal
 * separator or a unit suffix is refused rather than guessed).
 */
export function parseNumberCell(value: string | undefined): number | null {
  const v = (value ?? '').trim();
  if (v === '') return null;
  return /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/.test(v) ? Number(v) : Number.NaN;
}

/**
 * The 422 of an import that had problems: `{ error, problems: { line, column, message }[] }`,
 * plus `warnings` and, when form fields beside the file were wrong too, `error.fields`.
 */
export function csvRejection(
  problems: readonly CsvProblem[],
  warnings: readonly CsvProblem[] = [],
  fields: readonly { path: string; message: string }[] = [],
): Response {
  const n = problems.length;
  const message = n
    ? `The file has ${n} problem${n === 1 ? '' : 's'}; nothing was saved. Fix ${n === 1 ? 'it' : 'them'} and upload the whole file again.`
    : 'Some fields need attention; nothing was saved.';
  return Response.json(
    { error: { code: 'invalid_fields', message, ...(fields.length ? { fields } : {}) }, problems, warnings },
    { status: 422, headers: { 'cache-control': 'no-store' } },
  );
}

/** A CSV header read against the known columns: which column each index is, and what is wrong with it. */
export interface CsvHeader<C extends string> {
  /** Column index -> known column, or null for an ignored one. */
  byIndex: (C | null)[];
  /** Each known column's first index. */
  firstAt: Map<C, number>;
  problems: LineProblem[];
  warnings: LineProblem[];
}

/**
 * Reads a header row (line 1; a byte-order mark before the first name is dropped, names are
 * case-insensitive): unnamed and unknown columns are ignored with a warning, a repeated column and a
 * missing required one are problems.
 */
export function readCsvHeader<C extends string>(
  cells: readonly string[],
  known: readonly C[],
  required: readonly C[],
): CsvHeader<C> {
  const header: CsvHeader<C> = { byIndex: [], firstAt: new Map(), problems: [], warnings: [] };
  const isKnown = (name: string): name is C => (known as readonly string[]).includes(name);
  cells.forEach((raw, i) => {
    const name = (i === 0 ? raw.replace(/^\uFEFF/, '') : raw).trim().toLowerCase();
    if (name === '' || !isKnown(name)) {
      header.byIndex.push(null);
      header.warnings.push({
        line: 1,
        column: name === '' ? `(column ${i + 1})` : raw.trim(),
        message:
          name === ''
            ? `Column ${i + 1} has no name; its cells were ignored.`
            : `Unknown column “${raw.trim()}”: it was ignored. Known columns: ${known.join(', ')}.`,
      });
      return;
    }
    const earlier = header.firstAt.get(name);
    if (earlier !== undefined) {
      header.byIndex.push(null);
      header.problems.push({
        line: 1,
        column: name,
        message: `The column ${name} appears twice (columns ${earlier + 1} and ${i + 1}); keep one.`,
      });
      return;
    }
    header.firstAt.set(name, i);
    header.byIndex.push(name);
  });
  for (const column of required) {
    if (!header.firstAt.has(column))
      header.problems.push({
        line: 1,
        column,
        message: `The required column ${column} is missing from the header row.`,
      });
  }
  return header;
}

/** The one problem of a file that is not UTF-8 (line 0: the file as a whole). */
export const NOT_UTF8_PROBLEM: LineProblem = {
  line: 0,
  column: '',
  message: 'The file is not UTF-8 text. Save it as “CSV UTF-8 (comma delimited)” and upload it again.',
};
