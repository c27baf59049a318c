import {
  ROUTE_LIBRARY_LIMITS,
  airwayRowSchema,
  fixRowSchema,
  type AirwayRow,
  type FixRow,
} from '@/lib/validation/route-library';
import { parseCsv, parseNumberCell, type CsvProblem } from './csv';

/**
 * The fix and airway CSVs (the documented import formats): fixes `name, lat, lon` with an optional
 * `region`; airways `airway, sequence, fix`, one row per point, the points of an airway ordered by
 * `sequence`. Any problem refuses the whole file.
 */
export const FIX_CSV_COLUMNS = ['name', 'lat', 'lon', 'region'] as const;
export const AIRWAY_CSV_COLUMNS = ['airway', 'sequence', 'fix'] as const;

// Invented names (the airway letter X is not an ICAO route designator).
export const FIX_CSV_TEMPLATE = 'name,lat,lon,region\nQXMOA,62.5,-20,north atlantic\nQXNEB,65,-30,\n';
export const AIRWAY_CSV_TEMPLATE = 'airway,sequence,fix\nXN9,1,QXMOA\nXN9,2,QXNEB\n';

export interface LibraryCsvResult<T> {
  rows: T[];
  problems: CsvProblem[];
  warnings: CsvProblem[];
}

/** Reads a fix CSV: one fix a line; a name repeated with the same region is a problem. */
export function parseFixCsv(text: string): LibraryCsvResult<FixRow> {
  const table = parseCsv(text, {
    columns: [
      { name: 'name', required: true },
      { name: 'lat', required: true },
      { name: 'lon', required: true },
      { name: 'region' },
    ],
    maxRows: ROUTE_LIBRARY_LIMITS.maxRows,
  });
  const problems = [...table.problems];
  const rows: FixRow[] = [];
  if (table.headerLine === null || problems.length) return { rows: [], problems, warnings: table.warnings };
  const seen = new Map<string, number>();
  for (const row of table.rows) {
    const v = row.values;
    const lat = parseNumberCell(v.lat);
    const lon = parseNumberCell(v.lon);
    const parsed = fixRowSchema.safeParse({
      name: v.name ?? '',
      lat: lat === null ? undefined : lat,
      lon: lon === null ? undefined : lon,
      ...(v.region ? { region: v.region } : {}),
    });
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const column = String(issue.path[0] ?? '');
        const message =
          (column === 'lat' || column === 'lon') && Number.isNaN(column === 'lat' ? lat : lon)
            ? `Give the ${column === 'lat' ? 'latitude' : 'longitude'} in decimal degrees, such as ${column === 'lat' ? '62.5' : '-20.25'}.`
            : issue.message;
        problems.push({ line: row.line, column, message });
      }
      continue;
    }
    const key = `${parsed.data.name}|${(parsed.data.region ?? '').toLowerCase()}`;
    const first = seen.get(key);
    if (first !== undefined) {
      problems.push({
        line: row.line,
        column: 'name',
        message: `${parsed.data.name} is already on line ${first}${parsed.data.region ? ' with the same region' : ''}: give each same-named fix a different region.`,
      });
      continue;
    }
    seen.set(key, row.line);
    rows.push(parsed.data);
  }
  return { rows: problems.length ? [] : rows, problems, warnings: table.warnings };
}

/** Reads an airway CSV: rows grouped by airway, ordered by their whole-number `sequence` (no repeats). */
export function parseAirwayCsv(text: string): LibraryCsvResult<AirwayRow> {
  const table = parseCsv(text, {
    columns: AIRWAY_CSV_COLUMNS.map((name) => ({ name, required: true })),
    maxRows: ROUTE_LIBRARY_LIMITS.maxRows,
  });
  const problems = [...table.problems];
  if (table.headerLine === null || problems.length) return { rows: [], problems, warnings: table.warnings };
  const groups = new Map<string, { line: number; points: { sequence: number; fix: string; line: number }[] }>();
  for (const row of table.rows) {
    const v = row.values;
    const name = (v.airway ?? '').trim().toUpperCase();
    const fix = (v.fix ?? '').trim().toUpperCase();
    const sequence = parseNumberCell(v.sequence);
    let ok = true;
    if (!/^[A-Z0-9]{2,12}$/.test(name)) {
      problems.push({
        line: row.line,
        column: 'airway',
        message: 'An airway designator has 2 to 12 letters and digits, such as XN9.',
      });
      ok = false;
    }
    if (sequence === null || !Number.isInteger(sequence) || sequence < 0) {
      problems.push({
        line: row.line,
        column: 'sequence',
        message: 'Give the sequence as a whole number, such as 1, 2, 3 along the airway.',
      });
      ok = false;
    }
    if (!/^[A-Z0-9]{2,12}$/.test(fix)) {
      problems.push({
        line: row.line,
        column: 'fix',
        message: 'A fix name has 2 to 12 letters and digits, such as QXBEL.',
      });
      ok = false;
    }
    if (!ok || sequence === null) continue;
    const g = groups.get(name) ?? { line: row.line, points: [] };
    const dup = g.points.find((p) => p.sequence === sequence);
    if (dup) {
      problems.push({
        line: row.line,
        column: 'sequence',
        message: `${name} already has sequence ${sequence} on line ${dup.line}.`,
      });
      continue;
    }
    g.points.push({ sequence, fix, line: row.line });
    groups.set(name, g);
  }
  const rows: AirwayRow[] = [];
  for (const [name, g] of groups) {
    const fixes = g.points.sort((a, b) => a.sequence - b.sequence).map((p) => p.fix);
    const parsed = airwayRowSchema.safeParse({ name, fixes });
    if (!parsed.success) {
      for (const issue of parsed.error.issues)
        problems.push({
          line: g.line,
          column: issue.path[0] === 'name' ? 'airway' : 'fix',
          message: `${name}: ${issue.message}`,
        });
      continue;
    }
    rows.push(parsed.data);
  }
  return { rows: problems.length ? [] : rows, problems, warnings: table.warnings };
}
