import { z } from 'zod';
import {
  screeningInputSchema,
  screeningPreviewBodySchema,
  soundingLevelSchema,
  compareCruiseLevelsOptionsSchema,
} from '@/lib/validation/screening';
import { workspaceCreateSchema, apiKeyCreateSchema } from '@/lib/validation/workspaces';
import {
  billingEmailSchema,
  cardChoiceSchema,
  subscribeSchema,
  subscriptionUpdateSchema,
  usageBudgetSchema,
} from '@/lib/validation/billing';
import { reportCreateSchema, reportSendSchema } from '@/lib/validation/reports';
import { fleetCreateSchema, fleetUpdateSchema } from '@/lib/validation/fleets';
import {
  aircraftTypeSaveSchema,
  engineSaveSchema,
  routeSaveSchema,
  soundingCreateSchema,
} from '@/lib/validation/library';
import { fixRowSchema } from '@/lib/validation/route-library';
import {
  periodCreateSchema,
  periodReopenSchema,
  periodSignSchema,
  periodTargetsSchema,
} from '@/lib/validation/periods';

/**
 * The OpenAPI 3.1 document of /api/v1, with request schemas generated from the same zod schemas the
 * handlers validate with. Every v1 route.ts must appear here (a test walks app/api/v1 to check).
 */
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface OperationSpec {
  summary: string;
  permission?: string;
  requestBody?: z.ZodType | { multipart: Record<string, string> };
  query?: Record<string, string>;
  responses: Record<string, string>;
}

const schema = (s: z.ZodType) => z.toJSONSchema(s, { target: 'draft-2020-12', unrepresentable: 'any', io: 'input' });

const ERRORS = {
  '400': 'Unreadable body',
  '401': 'Not signed in and no key',
  '403': 'Role lacks permission',
  '404': 'Unknown or not yours',
  '422': 'Invalid fields',
  '429': 'Throttled',
};

type Responses = Record<string, string>;

/** An operation: the permission it needs (none: public), what it does, what it answers besides ERRORS. */
const op = (
  permission: string | undefined,
  summary: string,
  responses: Responses,
  more: Pick<OperationSpec, 'requestBody' | 'query'> = {},
): OperationSpec => ({ summary, ...(permission ? { permission } : {}), ...more, responses });

/** A read of workspace data (`flights:read`), with its query parameters if any. */
const read = (summary: string, responses: Responses, query?: Record<string, string>): OperationSpec =>
  op('flights:read', summary, responses, query ? { query } : {});

/** A write with a JSON body validated by `body`. */
const write = (permission: string, summary: string, body: z.ZodType, responses: Responses): OperationSpec =>
  op(permission, summary, responses, { requestBody: body });

/** A delete answering 204 (and any other answers given). */
const remove = (permission: string, summary: string, responses: Responses = {}): OperationSpec =>
  op(permission, summary, { '204': 'Deleted', ...responses });

/** A CSV upload (multipart fields): 201 with `created`, or 413 / 422 with the problems table and warnings. */
const csvUpload = (
  permission: string,
  summary: string,
  multipart: Record<string, string>,
  created = '{ added, updated, warnings }',
): OperationSpec =>
  op(
    permission,
    summary,
    { '201': created, '413': 'File too large', '422': '{ error, problems: { line, column, message }[], warnings }' },
    { requestBody: { multipart } },
  );

export const API_OPERATIONS: Record<string, Partial<Record<Method, OperationSpec>>> = {
  '/workspaces': {
    get: { summary: "The caller's workspaces, each { slug, name, role }", responses: { '200': 'List' } },
    post: {
      summary: 'Create a workspace; the creator is owner',
      requestBody: workspaceCreateSchema,
      responses: { '201': 'Created', '409': 'Address taken' },
    },
  },
  '/workspaces/{slug}/api-keys': {
    get: {
      summary: 'Active API keys (never the keys themselves)',
      permission: 'apikeys:manage',
      responses: { '200': 'List' },
    },
    post: {
      summary: 'Create a key; the key is returned once',
      permission: 'apikeys:manage',
      requestBody: apiKeyCreateSchema,
      responses: { '201': '{ id, name, role, key }' },
    },
  },
  '/workspaces/{slug}/api-keys/{id}': {
    delete: { summary: 'Revoke a key', permission: 'apikeys:manage', responses: { '204': 'Revoked' } },
  },
  '/workspaces/{slug}/usage': {
    get: {
      summary:
        "The current billing period's metered usage (one unit per screened flight) and estimated charge (base fee + units x per-flight price, 0 in a free trial), with how many units the payment service has counted and the ledger-versus-provider reconciliation over the period's minute-aligned window",
      permission: 'usage:read',
      responses: {
        '200':
          '{ units, periodStart, periodEnd, estimatedChargeCents, planId, status, sentUnits, pendingUnits, reconciliation: { ledgerUnits, providerUnits, difference, checkedAt } | null, ... }',
      },
    },
  },
  '/workspaces/{slug}/billing': {
    get: {
      summary:
        'Plan, status, trial or period end, cancel-at-period-end, billing e-mail, test card on file, and invoices (null while the payment service is unreachable)',
      permission: 'billing:read',
      responses: { '200': 'The billing state with invoices' },
    },
    patch: {
      summary: 'Set the billing e-mail (empty string: payment problems go to owners and finance admins only)',
      permission: 'billing:manage',
      requestBody: billingEmailSchema,
      responses: { '200': 'The billing state', '503': 'The payment service did not answer; nothing changed' },
    },
  },
  '/workspaces/{slug}/billing/subscription': {
    post: {
      summary:
        'Subscribe from a trial (the rest of the trial stays free) or after a cancellation, with a test card on file',
      permission: 'billing:manage',
      requestBody: subscribeSchema,
      responses: {
        '201': 'The billing state',
        '409': 'Already subscribed',
        '503': 'The payment service did not answer; nothing changed',
      },
    },
    patch: {
      summary: 'Change plan (applies to the whole open period) and/or cancel at period end (true) or resume (false)',
      permission: 'billing:manage',
      requestBody: subscriptionUpdateSchema,
      responses: {
        '200': 'The billing state',
        '409': 'No running subscription',
        '503': 'The payment service did not answer; nothing changed',
      },
    },
  },
  '/workspaces/{slug}/billing/budget': {
    get: {
      summary:
        "The monthly usage budget and this billing period's usage against it: { budgetCents, hardStop, periodStart, periodEnd, units, perFlightCents, usageChargeCents, usedFraction, unitsLeft, freePeriod }",
      permission: 'billing:read',
      responses: { '200': 'The budget state' },
    },
    put: {
      summary:
        'Set the monthly usage budget (cents of per-flight charges in a billing period; null clears it) and its hard stop. The billing contacts are e-mailed once a period at 80 % and at 100 %; with hardStop, screenings and imports that would pass the budget are refused with 402. A free trial has no budget.',
      permission: 'billing:manage',
      requestBody: usageBudgetSchema,
      responses: { '200': 'The budget state' },
    },
  },
  '/workspaces/{slug}/billing/payment-method': {
    put: {
      summary: 'Put a test card on file for future invoices: "succeeds" or "declined"',
      permission: 'billing:manage',
      requestBody: cardChoiceSchema,
      responses: { '200': 'The billing state', '503': 'The payment service did not answer; nothing changed' },
    },
  },
  '/workspaces/{slug}/billing/invoices/pay': {
    post: {
      summary: 'Charge the open invoices with the card on file; screening resumes once they are paid',
      permission: 'billing:manage',
      responses: {
        '200': '{ paid, billing }',
        '402': 'The card was declined again',
        '503': 'The payment service did not answer',
      },
    },
  },
  '/workspaces/{slug}/invoices/{id}/pdf': {
    get: {
      summary: "An invoice's PDF, fetched from the payment service for members who may read billing",
      permission: 'billing:read',
      responses: { '200': 'application/pdf', '503': 'The payment service did not answer' },
    },
  },
  '/workspaces/{slug}/screenings': {
    post: {
      summary:
        "Screen and save one flight (one billable unit). Body: the screenFlight input plus optional name and aircraft (a type code of the workspace that supplies emission and Mach when absent). The route is { waypoints }, { flightPlan: { text, from, to } } (ICAO Doc 4444 item 15, named points and airways from the workspace's fix and airway libraries; its levels replace cruise; the result then carries flightPlan { waypoints, cruise.steps, speeds, unresolved, notes, items }) or { track: { points: { time?, lat, lon, flightLevel? | pressureAltitudeFt?, fuelFlowKgH? }[] } } (2-20 000 points in time order; cruise optional; fuel spread by the points' times, or with fuelFlowKgH on every timed point integrated over time in place of fuelBurnKg, which may then be left out; the result carries track). A step climb may be { atWaypoint, flightLevel } (the index in route.waypoints) instead of { fromKm, flightLevel }; it is saved as the distance to that waypoint. Fuel far outside a physical band per km for the route is a 422 on fuelBurnKg; unusual fuel is the first of the result's cautions. Idempotency-Key header: a repeat with the same key and the same body (key order aside) returns the first screening and adds no unit; the same key with a different body is refused (409).",
      permission: 'screenings:create',
      requestBody: screeningInputSchema,
      responses: {
        '201': '{ id, name, createdAt, input, result }',
        '200': 'Idempotent replay of the first result',
        '402': 'Billing blocks new screenings',
        '409': 'The Idempotency-Key was already used with a different body (the error names the key and the screening)',
      },
    },
    get: {
      summary: 'Saved screenings, newest first',
      permission: 'flights:read',
      query: {
        cursor: 'id from nextCursor',
        limit: '1-200',
        from: 'YYYY-MM-DD',
        to: 'YYYY-MM-DD',
        route: 'text',
        aircraft: 'type code',
        minShareAbove: '0-1',
        maxShareAbove: '0-1',
      },
      responses: { '200': '{ items, nextCursor }' },
    },
  },
  '/workspaces/{slug}/screenings/{id}': {
    get: {
      summary:
        'One saved screening with the engine version it was made with: engineVersion, currentEngineVersion, outdated, rescreenOf (the screening it re-made), rescreens (newer screenings made from it)',
      permission: 'flights:read',
      responses: {
        '200':
          '{ id, name, createdAt, engineVersion, currentEngineVersion, outdated, rescreenOf, rescreens, input, result }',
      },
    },
  },
  '/workspaces/{slug}/screenings/{id}/rescreen': {
    post: {
      summary:
        'Screen a saved screening again with the current engine version, saved as a new screening pointing at it (rescreenOf). Not billed: no usage unit and no billing gate, since the flight was billed when first screened. One re-screen per screening and engine version: a repeat returns it.',
      permission: 'screenings:create',
      responses: {
        '201': 'The new screening { id, name, createdAt, engineVersion, rescreenOf, input, result }',
        '200': 'The re-screen already made with this engine version',
        '409': 'The screening is already on the current engine version',
        '422': 'The saved input is not accepted by the current engine (fields named)',
      },
    },
  },
  '/workspaces/{slug}/screenings/{id}/export': {
    get: {
      summary:
        'One saved screening as a download: CSV (headline figures, then one row per segment) or JSON { id, name, createdAt, input, result }',
      permission: 'flights:read',
      query: { format: 'csv (default) or json' },
      responses: { '200': 'Attachment (text/csv or application/json)' },
    },
  },
  '/workspaces/{slug}/screenings/preview': {
    post: {
      summary:
        'Screen without saving (not billed, throttled), with the what-if cruise levels; optional whatIf options; a flight-plan route, steps at a waypoint and the fuel-per-km check as for saving; uncertainty { samples?, seed? } adds result.uncertainty (p5/p50/p95 of NOx above, share above and the ozone figure, with drivers); months: true adds the month sweep',
      permission: 'screenings:create',
      requestBody: screeningPreviewBodySchema,
      responses: {
        '200':
          '{ input, result, levels, months? }; result.uncertainty { samples, seed, noxAboveTropopauseKg, fractionAboveTropopause, ozoneLossKg: { p5, p50, p95 }, outsideScreeningRange, sampled, drivers, note } when asked; months { rows: { month, fractionAboveTropopause, noxAboveTropopauseKg, ozoneLoss: { centralKg, lowKg, highKg }, tropopauseSource, sameEveryMonth }[12], sameEveryMonth, note }',
      },
    },
  },
  '/workspaces/{slug}/imports': {
    post: {
      summary:
        'Upload a flight-schedule CSV (10 MB, 100 000 rows at most). Every row is checked first: any problem refuses the whole file (nothing saved); otherwise the import is queued and its flights are screened in the background, one billable unit per screened flight.',
      permission: 'imports:create',
      requestBody: { multipart: { file: 'the schedule CSV' } },
      query: {
        dryRun:
          '1: check every row and answer 200 { dryRun, rows, billableUnits, perFlightCents, estimatedChargeCents, freePeriod, budget, warnings } without saving anything (the estimate shown before confirming an import)',
      },
      responses: {
        '200': 'With dryRun=1: the estimate; nothing saved',
        '202': '{ id, status: queued, rows, rowsDone, problems (unknown-column warnings, line 1), ... }',
        '402': 'Billing blocks new screenings',
        '409': 'The same file (SHA-256) was already imported; names the earlier import',
        '413': 'Larger than 10 MB or more than 100 000 rows',
        '422': '{ error, problems: { line, column, message }[], problemCount }',
      },
    },
    get: {
      summary: 'Imports, newest first, with their progress',
      permission: 'flights:read',
      query: { cursor: 'id from nextCursor', limit: '1-100' },
      responses: { '200': '{ items, nextCursor }' },
    },
  },
  '/workspaces/{slug}/imports/{id}': {
    get: {
      summary:
        'One import: status (queued, screening, complete, failed), rows, rowsDone, rowsPerSecond, secondsLeft, problems, failureReason, engineVersions (flights per engine version), rescreen (progress of a re-screen with a newer engine, or null)',
      permission: 'flights:read',
      responses: { '200': 'The import' },
    },
    delete: {
      summary: 'Delete an import and its flights; units already billed for screened flights stay billed',
      permission: 'imports:delete',
      responses: { '200': '{ id, fileName, flightsDeleted, billedUnitsKept, message }' },
    },
  },
  '/workspaces/{slug}/imports/{id}/rescreen': {
    post: {
      summary:
        "Screen the import's flights again with the current engine version, in the background. Not billed: no usage unit and no billing gate, since each flight was billed when first screened. Progress is the import's rescreen { status: queued | running | complete, engineVersion, rows, rowsDone, rowsFailed }; a flight the current engine cannot screen keeps its earlier figures and version. Asking again while one runs returns it.",
      permission: 'imports:create',
      responses: {
        '202': 'The import with its rescreen progress and engineVersions',
        '409': 'The import is still screening, or every flight is already on the current engine version',
      },
    },
  },
  '/workspaces/{slug}/jobs/failed': {
    get: {
      summary:
        "The workspace's background jobs that used up their attempts (dead letters), newest first, not yet retried: { items: { id, jobName, label, reason, attempts, failedAt }[] }. A failing job is retried with growing pauses first; an owner queues a dead letter again from the imports page.",
      permission: 'jobs:manage',
      responses: { '200': '{ items }' },
    },
  },
  '/workspaces/{slug}/imports/template': {
    get: {
      summary: "A schedule CSV template with example rows using this workspace's aircraft types and fleets",
      permission: 'flights:read',
      responses: { '200': 'text/csv' },
    },
  },
  '/workspaces/{slug}/imports/tracks': {
    post: {
      summary:
        'Upload a flown-track CSV (80 MB, 1 000 000 points, 5 000 flights at most; read as a stream). Columns flight, date, time (HH:MM:SS UTC), lat, lon, altitude_ft or flight_level; optional fuel_flow_kg_h (on every point of a flight: integrated over time; else the planned flight fuel is spread by time), aircraft, origin, destination (else taken from the planned flight with the same flight number and date). Every point is checked first: any problem refuses the whole file (nothing saved); otherwise the import (kind tracks) is queued and each flight is screened in the background as a flown flight, one billable unit per flight.',
      permission: 'imports:create',
      requestBody: { multipart: { file: 'the track CSV' } },
      query: {
        dryRun: '1: check every point and flight and answer 200 { dryRun, flights, points, warnings }; nothing saved',
      },
      responses: {
        '200': 'With dryRun=1: the check; nothing saved',
        '202': '{ id, kind: tracks, status: queued, rows (flights), points, ... }',
        '402': 'Billing blocks new screenings',
        '409': 'The same file (SHA-256) was already imported',
        '413': 'Larger than 80 MB, more than 1 000 000 points or 5 000 flights',
        '422': '{ error, problems: { line, column, message }[], problemCount }',
      },
    },
  },
  '/workspaces/{slug}/imports/tracks/template': {
    get: {
      summary:
        "A flown-track CSV template: two short invented flights with fuel flows on one of this workspace's aircraft types",
      permission: 'flights:read',
      responses: { '200': 'text/csv' },
    },
  },
  '/workspaces/{slug}/flights': {
    get: {
      summary:
        'Flights, newest date first, each with flight, date, origin, destination, aircraft, fleet, cruiseFl, basis (planned: a schedule row; flown: an imported track), status and summary figures (distanceKm, fuelKg, noxTotalKg, noxAboveTropopauseKg, fractionAboveTropopause, ozoneLoss)',
      permission: 'flights:read',
      query: {
        import: 'import id',
        from: 'YYYY-MM-DD',
        to: 'YYYY-MM-DD',
        fleet: 'fleet id',
        aircraft: 'type code',
        basis: 'planned | flown',
        cursor: 'from nextCursor',
        limit: '1-200',
      },
      responses: { '200': '{ items, nextCursor }' },
    },
  },
  '/workspaces/{slug}/flights/{id}': {
    get: {
      summary:
        'One imported flight: its basis (planned or flown), inputs, figures, engine version, import (importFileName, sourceLine), trackPoints for a flown track, and, when the same flight (date, flight, origin, destination) was both planned and flown, paired (the other side) and comparison { planned, flown: { noxAboveTropopauseKg, fractionAboveTropopause, fuelKg }, noxAboveDeltaKg, shareAboveDelta } (flown minus planned). The page is /w/{slug}/flights/{id}.',
      permission: 'flights:read',
      responses: { '200': 'The flight', '404': 'No such flight in this workspace' },
    },
  },
  '/workspaces/{slug}/routes': {
    get: read('Saved routes, by name, each with its great-circle distanceKm', { '200': '{ items }' }),
    post: write(
      'library:write',
      'Save a route: name (unique in the workspace), waypoints ({ airport } or { lat, lon }), notes',
      routeSaveSchema,
      { '201': 'The route with distanceKm', '409': 'Name taken' },
    ),
  },
  '/workspaces/{slug}/routes/{id}': {
    get: read('One saved route', { '200': 'The route with distanceKm' }),
    patch: write('library:write', 'Change any of name, waypoints, notes', routeSaveSchema.partial(), {
      '200': 'The route',
      '409': 'Name taken',
    }),
    delete: remove('library:write', 'Delete a saved route'),
  },
  '/workspaces/{slug}/engines': {
    get: read('Engines (ICAO LTO certification fuel flows kg/s and EI NOx g/kg, idle, approach, climb-out, take-off)', {
      '200': '{ items }',
    }),
    post: write(
      'library:write',
      'Add an engine: four fuel flows rising idle to take-off, four EI NOx above 0 and at most 200 g/kg, source note',
      engineSaveSchema,
      { '201': 'The engine', '409': 'Name taken' },
    ),
  },
  '/workspaces/{slug}/engines/{id}': {
    get: read('One engine', { '200': 'The engine' }),
    patch: write('library:write', 'Change any of name, fuelFlowKgS, eiNoxGPerKg, source', engineSaveSchema, {
      '200': 'The engine',
      '409': 'Name taken',
    }),
    delete: remove('library:write', 'Delete an engine', { '409': 'An aircraft type uses it' }),
  },
  '/workspaces/{slug}/engines/import': {
    get: read('The engines CSV template', { '200': 'text/csv' }),
    post: csvUpload(
      'library:write',
      'Import engines from CSV (name, idle_ff_kg_s, approach_ff_kg_s, climb_out_ff_kg_s, take_off_ff_kg_s, idle_ei, approach_ei, climb_out_ei, take_off_ei, source), all or nothing',
      { file: 'The CSV, UTF-8, header row first' },
      '{ items, warnings }',
    ),
  },
  '/workspaces/{slug}/aircraft-types': {
    get: read('Aircraft types, by code', { '200': '{ items }' }),
    post: write(
      'library:write',
      'Add an aircraft type: code (unique), engine or direct EI NOx, engine count, typical Mach and flight level, default fleet',
      aircraftTypeSaveSchema,
      { '201': 'The type', '409': 'Code taken' },
    ),
  },
  '/workspaces/{slug}/aircraft-types/{id}': {
    get: read('One aircraft type', { '200': 'The type' }),
    patch: write('library:write', 'Change any field of a type', aircraftTypeSaveSchema, {
      '200': 'The type',
      '409': 'Code taken',
    }),
    delete: remove('library:write', 'Delete an aircraft type'),
  },
  '/workspaces/{slug}/soundings': {
    get: read('Soundings, newest first, each with its levels and WMO tropopause (or null)', { '200': '{ items }' }),
    post: write(
      'library:write',
      'Store a sounding { name, station?, observedAt?, levels }; its WMO (1957) tropopause is found and stored',
      soundingCreateSchema,
      { '201': 'The sounding' },
    ),
  },
  '/workspaces/{slug}/soundings/upload': {
    post: csvUpload(
      'library:write',
      'A sounding from a CSV of levels (altitude_m and/or pressure_hpa; temperature_k or temperature_c); form fields name, station, observedAt',
      {
        file: 'The CSV of levels',
        name: 'Sounding name',
        station: 'Station (optional)',
        observedAt: 'YYYY-MM-DDTHH:MMZ (optional)',
      },
      'The sounding',
    ),
  },
  '/workspaces/{slug}/soundings/{id}': {
    get: read('One sounding', { '200': 'The sounding' }),
    delete: remove('library:write', 'Delete a sounding'),
  },
  '/workspaces/{slug}/fixes': {
    get: read(
      "The workspace's named points (fix library) by name",
      { '200': '{ items: { id, name, region, lat, lon, createdAt }[] }' },
      { q: 'name prefix', limit: '1-500 (default 200)' },
    ),
    post: write(
      'navdata:write',
      'Add named points; one with the same name and region is moved',
      z.object({ fixes: z.array(fixRowSchema) }),
      { '201': '{ added, updated }' },
    ),
  },
  '/workspaces/{slug}/fixes/upload': {
    post: csvUpload(
      'navdata:write',
      'Named points from a CSV: name, lat, lon (degrees), optional region to tell same-named points apart',
      { file: 'The CSV of fixes' },
    ),
  },
  '/workspaces/{slug}/fixes/{id}': {
    delete: remove('navdata:write', 'Delete a named point'),
  },
  '/workspaces/{slug}/airways': {
    get: read(
      "The workspace's airways by designator, each with its fix names in order",
      { '200': '{ items: { id, name, fixes, createdAt }[] }' },
      { q: 'designator prefix', limit: '1-500 (default 200)' },
    ),
  },
  '/workspaces/{slug}/airways/upload': {
    post: csvUpload(
      'navdata:write',
      'Airways from a CSV: airway, sequence, fix (one row per point); an airway already present is replaced',
      { file: 'The CSV of airway points' },
    ),
  },
  '/workspaces/{slug}/airways/{id}': {
    delete: remove('navdata:write', 'Delete an airway'),
  },
  '/atmosphere': {
    get: {
      summary: 'ICAO standard atmosphere at a flight level or altitude',
      query: { flightLevel: 'number', altitudeM: 'geopotential m' },
      responses: { '200': '{ temperatureK, pressurePa, densityKgM3, speedOfSoundMs, ... }' },
    },
  },
  '/tropopause': {
    post: {
      summary: 'WMO (1957) lapse-rate tropopause of a sounding',
      requestBody: z.object({ levels: z.array(soundingLevelSchema) }),
      responses: { '200': '{ tropopause: { altitudeM, temperatureK, pressureHpa } | null }' },
    },
  },
  '/airports': {
    get: {
      summary: 'Airport type-ahead by ICAO/IATA code or name (at most 20)',
      query: { q: 'text', limit: '1-20' },
      responses: { '200': '{ items: { icao, iata, name, country, lat, lon }[] }' },
    },
  },
  '/workspaces/{slug}/fleets': {
    get: read('Fleets, each with the aircraft types that default to it and its screened flights', {
      '200': '{ items }',
    }),
    post: write('fleets:write', 'Create a fleet', fleetCreateSchema, { '201': 'The fleet', '409': 'Name taken' }),
  },
  '/workspaces/{slug}/fleets/{id}': {
    get: read('One fleet', { '200': 'The fleet' }),
    patch: write(
      'fleets:write',
      'Rename or describe a fleet, or set exactly which aircraft types default to it (aircraftTypeIds)',
      fleetUpdateSchema,
      { '200': 'The fleet', '409': 'Name taken' },
    ),
    delete: remove('fleets:write', "Delete a fleet; its flights fall back to their aircraft type's default fleet"),
  },
  '/workspaces/{slug}/fleets/compare': {
    get: {
      summary:
        "Fleet comparison of screened flights (SI units): rows per fleet (and month or aircraft type), totals with ratios from sums, monthly series per fleet, fleet-scale context, cautions. A flight's fleet is its own (CSV fleet column), else its aircraft type's default.",
      permission: 'flights:read',
      query: {
        from: 'YYYY-MM-DD (default: first day of the month two months before `to`)',
        to: 'YYYY-MM-DD (default: today)',
        aircraft: 'aircraft type code',
        route: 'airport codes, e.g. EGLL or EGLL-KSFO (origin or destination)',
        minFl: 'level band bottom, 0-660',
        maxFl: 'level band top, 0-660',
        groupBy: 'fleet | month | aircraft',
        basis:
          'planned (default: schedule flights) | flown (imported tracks) | flown-where-available (each flight once: its screened flown track where there is one, else its plan)',
        fleets: 'comma-separated fleet ids',
      },
      responses: {
        '200':
          '{ period, groupBy, filters, rows, totals, months, series, context, notes, cautions, engineVersions, mixedEngineVersions, percentiles }; percentiles (null without flights; { pending: true, flightsPending, flights } while the worker builds the sampling data of the flights) { samples: 400, seed: 1, engineVersion, fleets: { fleetId, flights, flightsSampled, noxAboveTropopauseKg, fractionAboveTropopause, ozoneLossKg: { p5, p50, p95 } }[], total (the same, fleetId null), flightsLeftOut, correlation, note }: 5-95 % of each fleet total from sampling its flights together (shared systematic inputs, tropopause error half shared per 10-degree band and month), never a sum of flight percentiles',
      },
    },
  },
  '/workspaces/{slug}/reports': {
    get: read(
      'Stored fleet reports, newest first',
      { '200': '{ items, nextCursor }' },
      { cursor: 'id from nextCursor', limit: '1-200' },
    ),
    post: write(
      'reports:create',
      "Build and store a fleet report (PDF in the builder's units, CSV in SI units) for a period and fleets",
      reportCreateSchema,
      { '201': 'The report with links to pdf and csv' },
    ),
  },
  '/workspaces/{slug}/reports/{id}': {
    get: read(
      'One report with its summary and e-mail send history (sendHistory: { id, recipients, sentBy, status: queued | sent | failed, messageId, error, attempts, queuedAt, sentAt, failedAt })',
      {
        '200':
          'The report; summary.percentiles (reports built since it was kept) as in fleets/compare: p5/p50/p95 of each fleet total and of all together',
      },
    ),
    delete: remove(
      'reports:delete',
      'Delete the report, its stored files and its e-mail history (the audit log keeps a record)',
    ),
  },
  '/workspaces/{slug}/reports/{id}/pdf': {
    get: read('The report PDF as an attachment', { '200': 'application/pdf' }),
  },
  '/workspaces/{slug}/reports/{id}/csv': {
    get: read(
      'The report CSV (RFC 4180, formula cells neutralised) as an attachment; nox_above_tropopause_p5_kg, nox_above_tropopause_p95_kg, ozone_loss_p5_kg, ozone_loss_p95_kg filled on the total rows',
      { '200': 'text/csv' },
    ),
  },
  '/workspaces/{slug}/reports/{id}/send': {
    post: write(
      'reports:send',
      "Queue an e-mail of the report PDF to up to 20 recipients; a background job sends it (retried with back-off) and the report's sendHistory shows it queued, then sent or failed",
      reportSendSchema,
      {
        '202': "{ id, recipients, status: 'queued' }",
        '429': 'Too many report e-mails from this workspace in the last hour; nothing is queued',
        '503': 'The e-mail could not be queued; nothing is sent',
      },
    ),
  },
  '/workspaces/{slug}/periods': {
    get: read(
      'Reporting periods: the calendar years, quarters and months of every year with flights (and this year), then the custom periods, each with its state (open, review, signed)',
      { '200': '{ years: [{ year, periods }], custom }' },
    ),
    post: write('periods:define', 'Define a custom period { name, from, to } (at most 36 months)', periodCreateSchema, {
      '201': 'The period, its reference c{id}',
    }),
  },
  '/workspaces/{slug}/periods/{id}': {
    get: read(
      'One period by reference (2026, 2026-Q4, 2026-11 or c12): state and sign-off, figures (frozen in review or signed, else running) against its targets, trend over the four periods before, frozen flights (first 200), changes after the freeze',
      { '200': '{ period, figures, targets, trend, snapshot, changesAfterFreeze, frozenFlights }' },
    ),
  },
  '/workspaces/{slug}/periods/{id}/targets': {
    put: write(
      'targets:write',
      'Replace the targets of an open period, per fleet or workspace-wide (fleetId null): noxAboveT (t), shareAbovePct (%), noxAbovePer1000KmKg (kg); analysts are e-mailed once at 90 % and once at 100 % of each',
      periodTargetsSchema,
      { '200': '{ targets }', '409': 'The period is frozen' },
    ),
  },
  '/workspaces/{slug}/periods/{id}/review': {
    post: op(
      'periods:review',
      'Move an open period to review: freezes its flights, figures, engine versions and assumptions, its report PDF and its audit CSV with the CSV SHA-256',
      { '200': 'The period', '409': 'Not open, or flights still screening' },
    ),
  },
  '/workspaces/{slug}/periods/{id}/sign': {
    post: write(
      'periods:sign',
      "Sign a period in review: records the signer's name, the time and the SHA-256 of the frozen audit CSV; an optional hash must match it",
      periodSignSchema,
      { '200': 'The period', '409': 'Not in review, or the hash differs' },
    ),
  },
  '/workspaces/{slug}/periods/{id}/reopen': {
    post: write(
      'periods:reopen',
      'Reopen a period in review or signed, with a reason (audit log); its frozen copy is dropped',
      periodReopenSchema,
      { '200': 'The period', '409': 'Already open' },
    ),
  },
  '/workspaces/{slug}/periods/{id}/report': {
    get: read('The frozen report PDF of a period in review or signed', {
      '200': 'application/pdf',
      '409': 'The period is open',
    }),
  },
  '/workspaces/{slug}/periods/{id}/audit-pack': {
    get: read(
      'The audit pack of a signed period (zip): report.pdf, flights.csv (the bytes the sign-off hash covers), method-notes.txt, changes-after-sign-off.csv, sign-off.json',
      { '200': 'application/zip', '409': 'The period is not signed' },
    ),
  },
  '/openapi.json': {
    get: { summary: 'This document', responses: { '200': 'OpenAPI 3.1' } },
  },
};

export function buildOpenApiDocument(): Record<string, unknown> {
  const paths: Record<string, unknown> = {};
  for (const [path, ops] of Object.entries(API_OPERATIONS)) {
    const item: Record<string, unknown> = {};
    for (const [method, op] of Object.entries(ops) as [Method, OperationSpec][]) {
      const params = [...path.matchAll(/\{(\w+)\}/g)].map((m) => ({
        name: m[1],
        in: 'path',
        required: true,
        schema: { type: 'string' },
      }));
      for (const [name, description] of Object.entries(op.query ?? {}))
        params.push({ name, in: 'query', required: false, schema: { type: 'string' }, description } as never);
      let requestBody: unknown;
      if (op.requestBody && 'multipart' in op.requestBody) {
        requestBody = {
          required: true,
          content: {
            'multipart/form-data': {
              schema: {
                type: 'object',
                properties: Object.fromEntries(
                  Object.entries(op.requestBody.multipart).map(([k, d]) => [
                    k,
                    { type: 'string', format: 'binary', description: d },
                  ]),
                ),
              },
            },
          },
        };
      } else if (op.requestBody) {
        requestBody = {
          required: true,
          content: { 'application/json': { schema: schema(op.requestBody as z.ZodType) } },
        };
      }
      const responses: Record<string, unknown> = {};
      for (const [code, description] of Object.entries({ ...op.responses, ...ERRORS })) {
        responses[code] =
          Number(code) >= 400
            ? { description, content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } }
            : { description };
      }
      item[method] = {
        summary: op.summary,
        ...(op.permission ? { description: `Needs the workspace permission \`${op.permission}\`.` } : {}),
        parameters: params,
        ...(requestBody ? { requestBody } : {}),
        responses,
      };
    }
    paths[path] = item;
  }
  return {
    openapi: '3.1.0',
    info: {
      title: 'Tropopass API',
      version: '1',
      description: 'Screening estimates of NOx above the tropopause; not a certified inventory or a regulatory method.',
    },
    servers: [{ url: '/api/v1' }],
    security: [{ bearer: [] }, { session: [] }],
    components: {
      securitySchemes: {
        bearer: { type: 'http', scheme: 'bearer', description: 'A workspace API key' },
        session: { type: 'apiKey', in: 'cookie', name: 'next-auth.session-token' },
      },
      schemas: {
        Error: {
          type: 'object',
          required: ['error'],
          properties: {
            error: {
              type: 'object',
              required: ['code', 'message'],
              properties: {
                code: { type: 'string' },
                message: { type: 'string' },
                fields: {
                  type: 'array',
                  items: { type: 'object', properties: { path: { type: 'string' }, message: { type: 'string' } } },
                },
              },
            },
          },
        },
        ScreeningInput: schema(screeningInputSchema),
        CompareCruiseLevelsOptions: schema(compareCruiseLevelsOptionsSchema),
      },
    },
    paths,
  };
}
