import 'server-only';
import { nowIso, writeTx } from '@/db/client';
import {
  findRescreen,
  findScreeningByIdempotencyKey,
  getStoredScreening,
  insertScreening,
  type StoredScreening,
} from '@/db/screenings';
import { recordUsage } from '@/db/usage';
import { assertBillingAllows } from '@/lib/billing/gate';
import { AppError } from '@/lib/errors';
import type { ScreeningResult } from '@/lib/screening';
import type { ScreeningInput } from '@/lib/validation/screening';

/** A saved screening with its engine input and result. */
export type ScreeningRecord = StoredScreening<ScreeningInput, ScreeningResult>;

/** "EGLL → KSFO", or coordinates for points that are not airports. */
export function routeLabel(input: ScreeningInput): string {
  if ('flightPlan' in input.route)
    return `${input.route.flightPlan.from.toUpperCase()} → ${input.route.flightPlan.to.toUpperCase()} (flight plan)`;
  if ('track' in input.route) {
    const pts = input.route.track.points;
    const at = (p: { lat: number; lon: number }) => `${p.lat.toFixed(1)},${p.lon.toFixed(1)}`;
    return `${at(pts[0])} → ${at(pts[pts.length - 1])} (track, ${pts.length} points)`;
  }
  const pts = input.route.waypoints;
  const label = (w: (typeof pts)[number]) =>
    'airport' in w ? w.airport.toUpperCase() : `${w.lat.toFixed(1)},${w.lon.toFixed(1)}`;
  const first = pts[0];
  const last = pts[pts.length - 1];
  return pts.length > 2
    ? `${label(first)} → ${label(last)} (${pts.length - 2} via)`
    : `${label(first)} → ${label(last)}`;
}

function firstLevel(input: ScreeningInput): number {
  return 'flightLevel' in input.cruise ? input.cruise.flightLevel : input.cruise.steps[0].flightLevel;
}

export function getScreening(scope: { workspaceId: number }, id: number): Promise<ScreeningRecord> {
  return getStoredScreening<ScreeningInput, ScreeningResult>(scope, id);
}

function idempotencyConflict(key: string, screeningId: number): AppError {
  return new AppError(
    'conflict',
    `The Idempotency-Key "${key}" was already used with a different request body (screening #${screeningId}). Send the same body to get that screening again, or use a new key for a new screening.`,
    {
      fields: [
        { path: 'Idempotency-Key', message: `Already used with a different body for screening #${screeningId}.` },
      ],
      extra: { idempotencyKey: key, screeningId },
    },
  );
}

/**
 * Stores a screening and its billable unit in one transaction, the billing gate inside it. With an
 * idempotency key, a repeat returns the first screening (`replayed: true`) and adds no unit.
 */
export async function createScreening(
  scope: { workspaceId: number },
  input: {
    name?: string;
    aircraftCode?: string | null;
    screening: ScreeningInput;
    result: ScreeningResult;
    createdBy: number | null;
    apiKeyId: number | null;
    idempotencyKey?: string | null;
    /** Fingerprint of the request body the key came with; a repeat of the key with another body is a 409. */
    idempotencyFingerprint?: string | null;
    /** Set for a re-screen: the older screening this one re-makes. Such a screening is not billed. */
    rescreenOf?: number | null;
  },
): Promise<{ record: ScreeningRecord; replayed: boolean }> {
  return writeTx(async (trx) => {
    if (input.idempotencyKey) {
      const prior = await findScreeningByIdempotencyKey<ScreeningInput, ScreeningResult>(
        trx,
        scope.workspaceId,
        input.idempotencyKey,
      );
      if (prior) {
        const fp = prior.fingerprint;
        if (fp && input.idempotencyFingerprint && fp !== input.idempotencyFingerprint)
          throw idempotencyConflict(input.idempotencyKey, prior.record.id);
        return { record: prior.record, replayed: true };
      }
    }
    const rescreenOf = input.rescreenOf ?? null;
    if (rescreenOf !== null) {
      const prior = await findRescreen<ScreeningInput, ScreeningResult>(
        trx,
        scope.workspaceId,
        rescreenOf,
        input.result.engineVersion,
      );
      if (prior) return { record: prior, replayed: true };
    } else {
      await assertBillingAllows(scope, trx);
    }
    const now = nowIso();
    const label = routeLabel(input.screening);
    const r = input.result;
    const record = await insertScreening<ScreeningInput, ScreeningResult>(trx, {
      workspaceId: scope.workspaceId,
      name: (input.name?.trim() || label).slice(0, 160),
      createdBy: input.createdBy,
      apiKeyId: input.apiKeyId,
      idempotencyKey: input.idempotencyKey ?? null,
      idempotencyFingerprint: input.idempotencyKey ? (input.idempotencyFingerprint ?? null) : null,
      rescreenOf,
      input: input.screening,
      result: r,
      engineVersion: r.engineVersion,
      routeLabel: label,
      aircraftCode: input.aircraftCode ?? null,
      flightLevel: firstLevel(input.screening),
      flightDate: input.screening.flightDate ?? null,
      distanceKm: r.distanceKm,
      fuelKg: r.fuelKg,
      noxTotalKg: r.noxTotalKg,
      noxAboveTropopauseKg: r.noxAboveTropopauseKg,
      fractionAboveTropopause: r.fractionAboveTropopause,
      ozoneLoss: r.ozoneLoss,
      createdAt: now,
    });
    // A re-screen repeats work already billed once (the source screening's unit): it records no unit
    // and passes no billing gate. The ledger's (kind, source_id) key could not catch it, since the
    // re-screen is a new screening id; this branch is what keeps it free.
    if (rescreenOf === null)
      await recordUsage(trx, {
        workspaceId: scope.workspaceId,
        kind: 'screening',
        sourceId: record.id,
        occurredAt: now,
      });
    return { record, replayed: false };
  });
}
