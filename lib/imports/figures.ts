import type { FlightFigures } from '@/db/imports';
import type { ScreeningTotals } from '@/lib/screening';

/** What a flight row keeps of its screening totals. */
export function figuresOf(r: ScreeningTotals): FlightFigures {
  return {
    distanceKm: r.distanceKm,
    noxTotalKg: r.noxTotalKg,
    noxAboveTropopauseKg: r.noxAboveTropopauseKg,
    fractionAboveTropopause: r.fractionAboveTropopause,
    meanDepthAboveTropopauseKm: r.meanDepthAboveTropopauseKm,
    ozoneCentralKg: r.ozoneLoss.centralKg,
    ozoneLowKg: r.ozoneLoss.lowKg,
    ozoneHighKg: r.ozoneLoss.highKg,
    engineVersion: r.engineVersion,
  };
}
