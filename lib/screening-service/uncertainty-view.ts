import {
  ENGINE_VERSION,
  SAME_EVERY_MONTH_NOTE,
  sampleUncertainty,
  sweepMonthsValidated,
  type MonthRow,
  type ScreeningResult,
  type ScreeningUncertainty,
} from '@/lib/screening';
import type { ScreeningInput } from '@/lib/validation/screening';

/**
 * The percentiles of a saved screening: the saved ones when it was sampled, else sampled now with
 * the defaults (400 samples, seed 1) when the saved result came from the current engine (otherwise
 * the percentiles would not belong to the figures beside them: null).
 */
export function uncertaintyFor(input: ScreeningInput, result: ScreeningResult): ScreeningUncertainty | null {
  if (result.uncertainty) return result.uncertainty;
  if (result.engineVersion !== ENGINE_VERSION || !Array.isArray(result.segments)) return null;
  return sampleUncertainty(input, result);
}

/** The month sweep of a saved input with the note a fixed tropopause needs; null if it no longer screens. */
export function monthsFor(input: ScreeningInput): { rows: MonthRow[]; note: string | null } | null {
  try {
    const rows = sweepMonthsValidated(input);
    return { rows, note: rows[0]?.sameEveryMonth ? SAME_EVERY_MONTH_NOTE : null };
  } catch {
    return null;
  }
}
