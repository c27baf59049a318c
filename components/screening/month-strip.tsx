import type { MonthRow } from '@/lib/screening';
import type { UnitSystem } from '@/lib/units';
import { formatMass, formatNumber, formatPercent, MONTH_NAMES } from '@/lib/format';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/**
 * The flight screened in each month: one column a month, bar height NOx above the tropopause, the
 * planned month marked. `note` explains a strip that is the same every month (a given tropopause).
 */
export function MonthStrip({
  rows,
  plannedMonth,
  units,
  note,
}: {
  rows: MonthRow[];
  plannedMonth: number | null;
  units: UnitSystem;
  note?: string | null;
}) {
  const max = rows.reduce((m, r) => Math.max(m, r.noxAboveTropopauseKg), 0);
  return (
    <div data-testid="month-strip" className="space-y-2">
      <ol className="grid grid-cols-12 gap-1" aria-label="NOx above the tropopause in each month">
        {rows.map((r) => {
          const planned = r.month === plannedMonth;
          const h = max > 0 ? Math.max(2, Math.round((r.noxAboveTropopauseKg / max) * 64)) : 2;
          const text = `${MONTH_NAMES[r.month - 1]}: ${formatMass(r.noxAboveTropopauseKg, units)} NOx above, ${formatPercent(r.fractionAboveTropopause)} of the flight's NOx, ozone figure ${formatMass(r.ozoneLoss.centralKg, units)}${planned ? ' (planned month)' : ''}`;
          return (
            <li
              key={r.month}
              title={text}
              aria-current={planned ? 'date' : undefined}
              data-planned={planned ? 'true' : undefined}
              className={`flex flex-col items-center rounded-sm px-0.5 pb-1 pt-1 ${planned ? 'bg-strato-soft ring-2 ring-strato' : ''}`}
            >
              <span className="sr-only">{text}</span>
              <span className="flex h-16 w-full items-end justify-center" aria-hidden="true">
                <span
                  className={`block w-3/4 rounded-t-sm ${planned ? 'bg-strato-strong' : 'bg-strato'}`}
                  style={{ height: `${h}px` }}
                />
              </span>
              <span
                className="figure mt-1 whitespace-nowrap text-[0.65rem] text-ink-soft"
                aria-hidden="true"
                data-testid="month-share"
              >
                {formatNumber(r.fractionAboveTropopause * 100, 0)}
                <span className="hidden sm:inline"> %</span>
              </span>
              <span className={`text-xs ${planned ? 'font-semibold text-ink' : 'text-ink-soft'}`} aria-hidden="true">
                {MONTHS[r.month - 1]}
              </span>
            </li>
          );
        })}
      </ol>
      <p className="text-xs text-ink-soft">
        Bar: NOx above the tropopause; figure: share of the flight&apos;s NOx above it, in %.{' '}
        {plannedMonth
          ? `The planned month (${MONTH_NAMES[plannedMonth - 1]}) is outlined.`
          : 'No month or date was given: the figures above use the annual mean.'}
      </p>
      {note ? <p className="text-xs text-ink-soft">{note}</p> : null}
    </div>
  );
}
