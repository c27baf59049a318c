import {
  SCREENING_LIMITS,
  soundingLevelProblems,
  soundingSetProblems,
  type FieldProblem,
  type SoundingLevelInput,
} from '@/lib/validation/screening';
import { toCsv } from '@/lib/csv/write';
import { parseCsv, parseNumberCell, type CsvProblem } from './csv';

/**
 * The soundings CSV (the documented import format): one level per line with `altitude_m`
 * (geopotential m) and/or `pressure_hpa`, and `temperature_k` or `temperature_c`. Levels may come
 * in any order. Celsius is converted to kelvin (T[K] = T[°C] + 273.15).
 */
export const SOUNDING_CSV_COLUMNS = ['altitude_m', 'pressure_hpa', 'temperature_k', 'temperature_c'] as const;

const CELSIUS_OFFSET = 273.15;

/** A header and a few ISA levels (ICAO Doc 7488/3 values), for the template download. */
export function soundingCsvTemplate(): string {
  const rows: [number, number, number][] = [
    [0, 1013.25, 288.15],
    [5000, 540.48, 255.65],
    [11000, 226.32, 216.65],
    [15000, 120.45, 216.65],
  ];
  return toCsv(['altitude_m', 'pressure_hpa', 'temperature_k'], rows);
}

export interface SoundingCsvResult {
  levels: SoundingLevelInput[];
  /** The file line of each level (header = 1), in the same order as `levels`. */
  lines: number[];
  /** The column the temperatures came from. */
  temperatureColumn: 'temperature_k' | 'temperature_c' | null;
  problems: CsvProblem[];
  warnings: CsvProblem[];
}

/**
 * Maps field problems of levels (`levels.N.altitudeM`, `levels.N`, `levels`) to CSV lines and
 * columns: `lines[N]` is level N's line; problems of the whole sounding go on line 1.
 */
export function levelProblemsToCsv(
  fields: readonly FieldProblem[],
  lines: readonly number[],
  temperatureColumn: string | null,
  prefix = 'levels',
): CsvProblem[] {
  return fields.map((f) => {
    const rest = f.path.startsWith(prefix) ? f.path.slice(prefix.length).replace(/^\./, '') : f.path;
    const [index, field] = rest.split('.');
    const n = /^\d+$/.test(index ?? '') ? Number(index) : null;
    const column =
      field === 'altitudeM'
        ? 'altitude_m'
        : field === 'pressureHpa'
          ? 'pressure_hpa'
          : field === 'temperatureK'
            ? (temperatureColumn ?? 'temperature_k')
            : '';
    return { line: n !== null && lines[n] !== undefined ? lines[n] : 1, column, message: f.message };
  });
}

function celsiusMessage(message: string): string {
  if (!/kelvin/.test(message)) return message;
  const lo = SCREENING_LIMITS.minSoundingTemperatureK - CELSIUS_OFFSET;
  const hi = SCREENING_LIMITS.maxSoundingTemperatureK - CELSIUS_OFFSET;
  return `The temperature must be between ${lo.toFixed(2)} °C and ${hi.toFixed(2)} °C.`;
}

/** Reads a sounding CSV into levels with every problem by line and column; any problem means nothing is saved. */
export function parseSoundingCsv(text: string): SoundingCsvResult {
  const table = parseCsv(text, {
    columns: SOUNDING_CSV_COLUMNS.map((name) => ({ name })),
    maxRows: SCREENING_LIMITS.maxSoundingLevels,
  });
  const problems = [...table.problems];
  const has = (c: string) => table.columns.includes(c);
  const rejected = (): SoundingCsvResult => ({
    levels: [],
    lines: [],
    temperatureColumn: null,
    problems,
    warnings: table.warnings,
  });
  if (table.headerLine === null) return rejected();
  const headerLine = table.headerLine;
  if (!has('altitude_m') && !has('pressure_hpa')) {
    problems.push({
      line: headerLine,
      column: 'altitude_m',
      message: 'The header needs an altitude_m or a pressure_hpa column (or both).',
    });
  }
  if (has('temperature_k') && has('temperature_c')) {
    problems.push({
      line: headerLine,
      column: 'temperature_c',
      message: 'Give temperature_k or temperature_c, not both.',
    });
  } else if (!has('temperature_k') && !has('temperature_c')) {
    problems.push({
      line: headerLine,
      column: 'temperature_k',
      message: 'The header needs a temperature_k or a temperature_c column.',
    });
  }
  if (problems.length) return rejected();
  const temperatureColumn = has('temperature_k') ? 'temperature_k' : 'temperature_c';

  const levels: SoundingLevelInput[] = [];
  const lines: number[] = [];
  const levelProblems: CsvProblem[] = [];
  const raw: Record<string, unknown>[] = [];
  for (const row of table.rows) {
    const cells: Partial<Record<(typeof SOUNDING_CSV_COLUMNS)[number], number>> = {};
    let unreadable = false;
    for (const column of SOUNDING_CSV_COLUMNS) {
      if (!has(column)) continue;
      const v = parseNumberCell(row.values[column]);
      if (v === null) continue;
      if (Number.isNaN(v)) {
        unreadable = true;
        levelProblems.push({
          line: row.line,
          column,
          message: `“${row.values[column]}” is not a number: write it with a decimal point, without units.`,
        });
      } else cells[column] = v;
    }
    const t =
      temperatureColumn === 'temperature_k'
        ? cells.temperature_k
        : cells.temperature_c === undefined
          ? undefined
          : cells.temperature_c + CELSIUS_OFFSET;
    const level: Record<string, unknown> = {
      ...(cells.altitude_m !== undefined ? { altitudeM: cells.altitude_m } : {}),
      ...(cells.pressure_hpa !== undefined ? { pressureHpa: cells.pressure_hpa } : {}),
      temperatureK: t,
    };
    if (!unreadable) {
      const own = soundingLevelProblems(level, `levels.${raw.length}`);
      const mapped = levelProblemsToCsv(own, [...lines, row.line], temperatureColumn).map((p) => ({
        ...p,
        column: p.column || (has('altitude_m') ? 'altitude_m' : 'pressure_hpa'),
        message:
          temperatureColumn === 'temperature_c' && p.column === 'temperature_c' ? celsiusMessage(p.message) : p.message,
      }));
      levelProblems.push(...mapped);
    }
    raw.push(level);
    lines.push(row.line);
    levels.push(level as unknown as SoundingLevelInput);
  }
  problems.push(...levelProblems);
  problems.push(...levelProblemsToCsv(soundingSetProblems(raw, 'levels'), lines, temperatureColumn));
  const order = (c: string) => (SOUNDING_CSV_COLUMNS as readonly string[]).indexOf(c);
  problems.sort((a, b) => a.line - b.line || order(a.column) - order(b.column));
  return { levels: problems.length ? [] : levels, lines, temperatureColumn, problems, warnings: table.warnings };
}
