import { MONTH_NAMES } from '@/lib/format';

/**
 * Reporting periods by reference: `2026` (a year), `2026-Q4` (a quarter), `2026-11` (a month), or
 * `c12` (the custom period with id 12). Calendar periods exist for every year without being stored;
 * a row is made the first time one gets a target or is moved to review. Dates are UTC calendar days,
 * both ends inclusive.
 */
export type PeriodKind = 'month' | 'quarter' | 'year' | 'custom';
export type PeriodState = 'open' | 'review' | 'signed';

export const PERIOD_STATE_LABELS: Record<PeriodState, string> = {
  open: 'Open',
  review: 'In review',
  signed: 'Signed',
};

export interface CalendarPeriod {
  ref: string;
  kind: Exclude<PeriodKind, 'custom'>;
  name: string;
  from: string;
  to: string;
}

const pad = (n: number) => String(n).padStart(2, '0');

function lastDay(year: number, month: number): string {
  const d = new Date(Date.UTC(year, month, 0));
  return `${year}-${pad(month)}-${pad(d.getUTCDate())}`;
}

export function monthPeriod(year: number, month: number): CalendarPeriod {
  return {
    ref: `${year}-${pad(month)}`,
    kind: 'month',
    name: `${MONTH_NAMES[month - 1]} ${year}`,
    from: `${year}-${pad(month)}-01`,
    to: lastDay(year, month),
  };
}

export function quarterPeriod(year: number, quarter: number): CalendarPeriod {
  const first = (quarter - 1) * 3 + 1;
  return {
    ref: `${year}-Q${quarter}`,
    kind: 'quarter',
    name: `Q${quarter} ${year}`,
    from: `${year}-${pad(first)}-01`,
    to: lastDay(year, first + 2),
  };
}

export function yearPeriod(year: number): CalendarPeriod {
  return { ref: String(year), kind: 'year', name: `Year ${year}`, from: `${year}-01-01`, to: `${year}-12-31` };
}

const YEAR_MIN = 1950;
const YEAR_MAX = 2200;

/** A calendar reference -> its period; null for anything else (custom references included). */
export function parseCalendarRef(ref: string): CalendarPeriod | null {
  let m = /^(\d{4})$/.exec(ref);
  const okYear = (y: number) => y >= YEAR_MIN && y <= YEAR_MAX;
  if (m) return okYear(Number(m[1])) ? yearPeriod(Number(m[1])) : null;
  m = /^(\d{4})-Q([1-4])$/.exec(ref);
  if (m) return okYear(Number(m[1])) ? quarterPeriod(Number(m[1]), Number(m[2])) : null;
  m = /^(\d{4})-(0[1-9]|1[0-2])$/.exec(ref);
  if (m) return okYear(Number(m[1])) ? monthPeriod(Number(m[1]), Number(m[2])) : null;
  return null;
}

/** The id of a custom reference (`c12` -> 12), else null. */
export function customIdOf(ref: string): number | null {
  const m = /^c(\d{1,10})$/.exec(ref);
  if (!m) return null;
  const id = Number(m[1]);
  return id > 0 && id <= 2_147_483_647 ? id : null;
}

export const customRef = (id: number): string => `c${id}`;

/** A year's periods: the year, its quarters, then its months. */
export function calendarPeriodsOfYear(year: number): CalendarPeriod[] {
  return [
    yearPeriod(year),
    ...[1, 2, 3, 4].map((q) => quarterPeriod(year, q)),
    ...MONTH_NAMES.map((_, i) => monthPeriod(year, i + 1)),
  ];
}

/** The `n` periods of the same kind before this one, oldest first. */
export function previousPeriods(p: CalendarPeriod, n: number): CalendarPeriod[] {
  const out: CalendarPeriod[] = [];
  const year = Number(p.from.slice(0, 4));
  const month = Number(p.from.slice(5, 7));
  for (let i = n; i >= 1; i--) {
    if (p.kind === 'year') out.push(yearPeriod(year - i));
    else if (p.kind === 'quarter') {
      const idx = year * 4 + (month - 1) / 3 - i;
      out.push(quarterPeriod(Math.floor(idx / 4), (idx % 4) + 1));
    } else {
      const idx = year * 12 + (month - 1) - i;
      out.push(monthPeriod(Math.floor(idx / 12), (idx % 12) + 1));
    }
  }
  return out;
}

/** The calendar period of a kind that holds a day (YYYY-MM-DD). */
export function periodContaining(kind: CalendarPeriod['kind'], day: string): CalendarPeriod {
  const year = Number(day.slice(0, 4));
  const month = Number(day.slice(5, 7));
  if (kind === 'year') return yearPeriod(year);
  if (kind === 'quarter') return quarterPeriod(year, Math.floor((month - 1) / 3) + 1);
  return monthPeriod(year, month);
}
