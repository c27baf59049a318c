import { engineSaveSchema, ENGINE_CSV_MAX_ROWS, type EngineSave } from '@/lib/validation/library';
import { toCsv } from '@/lib/csv/write';
import { parseCsv, parseNumberCell, type CsvProblem } from './csv';

/**
 * The engines CSV (the documented import format): `name, idle_ff_kg_s, approach_ff_kg_s,
 * climb_out_ff_kg_s, take_off_ff_kg_s, idle_ei, approach_ei, climb_out_ei, take_off_ei, source`,
 * fuel flows in kg/s per engine and EI NOx in g/kg at the ICAO LTO modes; `source` may be left out.
 */
export const ENGINE_CSV_FUEL_FLOW_COLUMNS = [
  'idle_ff_kg_s',
  'approach_ff_kg_s',
  'climb_out_ff_kg_s',
  'take_off_ff_kg_s',
] as const;
export const ENGINE_CSV_EI_COLUMNS = ['idle_ei', 'approach_ei', 'climb_out_ei', 'take_off_ei'] as const;
export const ENGINE_CSV_COLUMNS = [
  'name',
  ...ENGINE_CSV_FUEL_FLOW_COLUMNS,
  ...ENGINE_CSV_EI_COLUMNS,
  'source',
] as const;

/** A header and one example row, for the template download (invented values, marked as such). */
export function engineCsvTemplate(): string {
  const example = [
    'Example turbofan (replace me)',
    0.1,
    0.3,
    0.9,
    1.1,
    4.5,
    10.2,
    22.8,
    30.5,
    'Invented example values; put the certification data sheet reference here',
  ];
  return toCsv(ENGINE_CSV_COLUMNS, [example]);
}

export interface EngineCsvResult {
  engines: EngineSave[];
  /** Every problem by line (header = 1) and column; any problem means nothing is imported. */
  problems: CsvProblem[];
  /** Ignored columns and the like: they do not stop the import. */
  warnings: CsvProblem[];
}

function columnOfPath(path: (string | number | symbol)[]): string {
  const [field, index] = path;
  if (field === 'fuelFlowKgS' && typeof index === 'number')
    return ENGINE_CSV_FUEL_FLOW_COLUMNS[index] ?? 'idle_ff_kg_s';
  if (field === 'eiNoxGPerKg' && typeof index === 'number') return ENGINE_CSV_EI_COLUMNS[index] ?? 'idle_ei';
  return typeof field === 'string' ? field : '';
}

/**
 * Reads an engines CSV and checks every row with the engine schema. Names already in the
 * workspace (`existingNames`, lower-case) or repeated in the file are problems.
 */
export function parseEnginesCsv(text: string, options: { existingNames: ReadonlySet<string> }): EngineCsvResult {
  const table = parseCsv(text, {
    columns: ENGINE_CSV_COLUMNS.map((name) => ({ name, required: name !== 'source' })),
    maxRows: ENGINE_CSV_MAX_ROWS,
  });
  const problems = [...table.problems];
  const engines: EngineSave[] = [];
  if (table.headerLine === null || problems.some((p) => p.line === table.headerLine))
    return { engines, problems, warnings: table.warnings };
  if (table.rows.length === 0 && problems.length === 0) {
    problems.push({
      line: table.headerLine + 1,
      column: '',
      message: 'The file has a header but no engines. Add one engine per line below the header.',
    });
  }
  const seen = new Map<string, number>();
  for (const row of table.rows) {
    const rowProblems: CsvProblem[] = [];
    const numbers = (columns: readonly string[]) =>
      columns.map((column) => {
        const value = parseNumberCell(row.values[column]);
        if (value !== null && Number.isNaN(value)) {
          rowProblems.push({
            line: row.line,
            column,
            message: `“${row.values[column]}” is not a number: write it with a decimal point, without units.`,
          });
        }
        return value === null || Number.isNaN(value) ? undefined : value;
      });
    const candidate = {
      name: row.values.name ?? '',
      fuelFlowKgS: numbers(ENGINE_CSV_FUEL_FLOW_COLUMNS),
      eiNoxGPerKg: numbers(ENGINE_CSV_EI_COLUMNS),
      source: row.values.source ?? '',
    };
    const parsed = engineSaveSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const column = columnOfPath(issue.path);
        if (!rowProblems.some((p) => p.column === column))
          rowProblems.push({ line: row.line, column, message: issue.message });
      }
    } else {
      const key = parsed.data.name.toLowerCase();
      const earlier = seen.get(key);
      if (options.existingNames.has(key)) {
        rowProblems.push({
          line: row.line,
          column: 'name',
          message: `An engine called “${parsed.data.name}” is already in this workspace.`,
        });
      } else if (earlier !== undefined) {
        rowProblems.push({
          line: row.line,
          column: 'name',
          message: `“${parsed.data.name}” is already on line ${earlier} of this file.`,
        });
      } else {
        seen.set(key, row.line);
        engines.push(parsed.data);
      }
    }
    problems.push(...rowProblems);
  }
  const order = (c: string) => (ENGINE_CSV_COLUMNS as readonly string[]).indexOf(c);
  problems.sort((a, b) => a.line - b.line || order(a.column) - order(b.column));
  return { engines: problems.length ? [] : engines, problems, warnings: table.warnings };
}
