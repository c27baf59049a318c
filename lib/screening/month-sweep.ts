/**
 * The same flight screened with the climatology of each month (issue 12): which months put its NOx
 * above the tropopause. Masses in kg (NOx as NO2, O3).
 */
import { screenTotals, type TropopauseSource } from './screen-flight';
import type { RouteLibrary } from './flight-plan';
import { tropopauseFromSounding } from './tropopause';
import { validateScreeningInput } from './validate';
import type { ScreeningInput } from '../validation/screening';

/** One month of the sweep. */
export interface MonthRow {
  /** 1-12; the flight screened on the middle day of that month. */
  month: number;
  fractionAboveTropopause: number;
  noxAboveTropopauseKg: number;
  ozoneLoss: { centralKg: number; lowKg: number; highKg: number };
  /** Where the tropopause came from: the month's climatology, or the flight's own override or sounding. */
  tropopauseSource: TropopauseSource;
  /** True when an override or sounding fixes the tropopause: every row is then the flight's own screening. */
  sameEveryMonth: boolean;
}

/** What the sweep says when an override or sounding fixes the tropopause. */
export const SAME_EVERY_MONTH_NOTE =
  'The tropopause was given with the flight (an altitude, a pressure or a sounding with a tropopause), so it does not change with the month: every month shows the flight as screened. Remove the tropopause to sweep the climatology.';

/** The tropopause source a validated input will use when it fixes the tropopause, else null. */
function fixedTropopause(input: ScreeningInput): TropopauseSource | null {
  const tp = input.tropopause;
  if (tp === undefined) return null;
  if ('altitudeM' in tp) return 'override-altitude';
  if ('pressureHpa' in tp) return 'override-pressure';
  return tropopauseFromSounding(tp.sounding) === null ? null : 'sounding';
}

function row(
  month: number,
  input: ScreeningInput,
  source: TropopauseSource,
  same: boolean,
  library?: RouteLibrary,
): MonthRow {
  const t = screenTotals(input, library);
  return {
    month,
    fractionAboveTropopause: t.fractionAboveTropopause,
    noxAboveTropopauseKg: t.noxAboveTropopauseKg,
    ozoneLoss: { centralKg: t.ozoneLoss.centralKg, lowKg: t.ozoneLoss.lowKg, highKg: t.ozoneLoss.highKg },
    tropopauseSource: source,
    sameEveryMonth: same,
  };
}

/** As `screenAcrossMonths` for an already-validated input. */
export function sweepMonthsValidated(input: ScreeningInput, library?: RouteLibrary): MonthRow[] {
  const fixed = fixedTropopause(input);
  if (fixed !== null) {
    const own = row(
      input.month ?? (input.flightDate !== undefined ? Number(input.flightDate.slice(5, 7)) : 1),
      input,
      fixed,
      true,
      library,
    );
    return Array.from({ length: 12 }, (_, i) => ({ ...own, ozoneLoss: { ...own.ozoneLoss }, month: i + 1 }));
  }
  const base: ScreeningInput = { ...input, uncertainty: undefined, flightDate: undefined };
  return Array.from({ length: 12 }, (_, i) => row(i + 1, { ...base, month: i + 1 }, 'climatology', false, library));
}

/**
 * Screens `input` (the `screenFlight` input) once per month 1-12 with that month's climatological
 * tropopause, ozone profiles and sunlight (mid-month day): 12 rows. A tropopause given with the flight
 * (altitude, pressure, or a sounding that has one) makes every row the flight's own screening, each
 * marked `sameEveryMonth` (see SAME_EVERY_MONTH_NOTE). Invalid input throws ScreeningInputError.
 */
export function screenAcrossMonths(input: unknown): MonthRow[] {
  return sweepMonthsValidated(validateScreeningInput(input));
}
