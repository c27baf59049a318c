import 'server-only';
import { getFlight, getPairedFlight, type FlightDetail } from '@/db/flights';
import { notFound } from '@/lib/errors';
import { screenFlight, ScreeningInputError, type ScreeningResult } from '@/lib/screening';

/** One side of a flight (its plan or its flown track) as its page shows it. */
export interface FlightSide {
  flight: FlightDetail;
  /** The full result of its stored input with the current engine (segments for the profile); null when it cannot be screened. */
  result: ScreeningResult | null;
  resultError: string | null;
  /** Points of a flown track; null for a planned flight. */
  trackPoints: number | null;
}

export interface FlightComparison {
  planned: { noxAboveTropopauseKg: number | null; fractionAboveTropopause: number | null; fuelKg: number };
  flown: { noxAboveTropopauseKg: number | null; fractionAboveTropopause: number | null; fuelKg: number };
  /** Flown minus planned, kg; null while either is not screened. */
  noxAboveDeltaKg: number | null;
  /** Flown minus planned share of NOx above the tropopause (a fraction); null while either is not screened. */
  shareAboveDelta: number | null;
}

export interface FlightView {
  main: FlightSide;
  /** The same flight on the other basis (the flown track of a plan, or the plan of a track), when the workspace has it. */
  paired: FlightSide | null;
  comparison: FlightComparison | null;
}

function side(flight: FlightDetail): FlightSide {
  let result: ScreeningResult | null = null;
  let resultError: string | null = null;
  let trackPoints: number | null = null;
  try {
    const input = JSON.parse(flight.inputJson) as { route?: { track?: { points?: unknown[] } } };
    trackPoints = Array.isArray(input.route?.track?.points) ? input.route.track.points.length : null;
    result = screenFlight(input);
  } catch (err) {
    resultError =
      err instanceof ScreeningInputError
        ? err.fields.map((f) => `${f.path}: ${f.message}`).join('; ')
        : 'The stored input could not be screened again.';
  }
  return { flight, result, resultError, trackPoints };
}

/**
 * A flight of this workspace with its profile and, when the same flight (date, flight, origin,
 * destination) was both planned and flown, the other side and the differences. 404 for a flight of
 * another workspace or none.
 */
export async function getFlightView(scope: { workspaceId: number }, id: number): Promise<FlightView> {
  const flight = await getFlight(scope, id);
  if (!flight) throw notFound('No flight with that id in this workspace.');
  const other = await getPairedFlight(scope, flight);
  const main = side(flight);
  const paired = other ? side(other) : null;
  let comparison: FlightComparison | null = null;
  if (other) {
    const planned = flight.basis === 'planned' ? flight : other;
    const flown = flight.basis === 'flown' ? flight : other;
    const pick = (f: FlightDetail) => ({
      noxAboveTropopauseKg: f.noxAboveTropopauseKg,
      fractionAboveTropopause: f.fractionAboveTropopause,
      fuelKg: f.fuelKg,
    });
    const both = planned.status === 'screened' && flown.status === 'screened';
    comparison = {
      planned: pick(planned),
      flown: pick(flown),
      noxAboveDeltaKg: both ? (flown.noxAboveTropopauseKg ?? 0) - (planned.noxAboveTropopauseKg ?? 0) : null,
      shareAboveDelta: both ? (flown.fractionAboveTropopause ?? 0) - (planned.fractionAboveTropopause ?? 0) : null,
    };
  }
  return { main, paired, comparison };
}

/** The view without segments or the stored input, as the API returns it. */
export function flightViewJson(v: FlightView) {
  const strip = (s: FlightSide) => {
    const { inputJson, ...flight } = s.flight;
    void inputJson;
    return { ...flight, trackPoints: s.trackPoints, resultError: s.resultError };
  };
  return {
    ...strip(v.main),
    paired: v.paired ? strip(v.paired) : null,
    comparison: v.comparison,
  };
}
