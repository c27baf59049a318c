import 'server-only';
import { createHash } from 'node:crypto';
import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import {
  forEachFlightComponents,
  getFleetPercentiles,
  listFleetFlightRefs,
  listFlightInputs,
  putFleetPercentiles,
  saveBuiltComponents,
  type FleetFlightRef,
} from '@/db/flight-components';
import { buildComponents, COMPONENTS_CHUNK } from '@/lib/imports/components';
import type { FlightFilters } from '@/db/fleets';
import { ENGINE_VERSION, FleetPack, sampleFleetParts, type FleetUncertainty } from '@/lib/screening';
import { FLEET_PERCENTILES_NOTE } from './percentiles-note';
import type { FleetPercentiles, FleetPercentileRow, FleetPercentilesPending } from './types';

/** Samples and seed of every fleet percentile in the product: fixed, so a figure can be reproduced. */
export const FLEET_SAMPLES = 400;
export const FLEET_SEED = 1;

export { FLEET_PERCENTILES_NOTE };

/**
 * Flights lacking components (screened before they were kept, or not yet reached by the worker's
 * backlog) are built on the request when there are at most this many, in chunks stored in their own
 * transactions; with more, the answer is `{ pending }` and the worker's backlog builds them.
 */
export const LAZY_LIMIT = 2000;

const fleetKeyOf = (id: number | null) => (id === null ? 'none' : String(id));

async function buildMissing(stale: FleetFlightRef[], scope: { workspaceId: number }): Promise<void> {
  for (let i = 0; i < stale.length; i += COMPONENTS_CHUNK) {
    const chunk = stale.slice(i, i + COMPONENTS_CHUNK);
    const inputs = new Map(
      (
        await listFlightInputs(
          scope,
          chunk.map((r) => r.id),
        )
      ).map((f) => [f.id, f.inputJson]),
    );
    const flights = chunk.map((r) => ({
      id: r.id,
      workspaceId: scope.workspaceId,
      engineVersion: r.engineVersion,
      inputJson: inputs.get(r.id) ?? '{}',
    }));
    // On the event loop: the screening threads serve the import worker.
    await saveBuiltComponents(await buildComponents(flights, { threads: false }));
    await yieldToEventLoop();
  }
}

const inFlight = new Map<string, Promise<FleetPercentiles | FleetPercentilesPending>>();

/**
 * 5th, 50th and 95th percentiles of each fleet's total NOx above the tropopause, share above and
 * ozone figure, and of all the fleets together, for the screened flights the filters keep: 400
 * samples, seed 1, correlated as FLEET_PERCENTILES_NOTE says (never a sum of flight percentiles).
 * Stored by a digest of the flight set (ids, fleets, engine versions), samples, seed and engine
 * version: the same selection is sampled once. Flights without current components get them built
 * first (once). A flight whose figures come from an older engine version cannot be sampled with its
 * own figures and is left out and counted (`flightsLeftOut`): re-screening its import brings it in.
 */
export async function fleetPercentiles(
  scope: { workspaceId: number },
  filters: FlightFilters,
  opts: { lazyLimit?: number } = {},
): Promise<FleetPercentiles | FleetPercentilesPending | null> {
  const refs = await listFleetFlightRefs(scope, filters);
  if (refs.length === 0) return null;
  const hash = createHash('sha256').update(`${ENGINE_VERSION}|${FLEET_SAMPLES}|${FLEET_SEED}|`);
  let text = '';
  for (const r of refs) {
    text += `${r.id}:${fleetKeyOf(r.fleetId)}:${r.engineVersion};`;
    if (text.length > 65_536) {
      hash.update(text);
      text = '';
    }
  }
  const key = hash.update(text).digest('hex');
  const memo = `${scope.workspaceId}:${key}`;
  const running = inFlight.get(memo);
  if (running) return running;
  const work = (async () => {
    const stored = await getFleetPercentiles(scope, key);
    if (stored) return JSON.parse(stored) as FleetPercentiles;
    const stale = refs.filter((r) => !r.current);
    if (stale.length > (opts.lazyLimit ?? LAZY_LIMIT))
      return { pending: true as const, flightsPending: stale.length, flights: refs.length };
    if (stale.length) await buildMissing(stale, scope);
    const packs = new Map<string, { fleetId: number | null; pack: FleetPack }>();
    for (const r of refs) {
      const k = fleetKeyOf(r.fleetId);
      if (!packs.has(k)) packs.set(k, { fleetId: r.fleetId, pack: new FleetPack(256) });
    }
    await forEachFlightComponents(scope, refs, (ref, data) => {
      packs.get(fleetKeyOf(ref.fleetId))?.pack.addEncoded(data);
    });
    const options = { samples: FLEET_SAMPLES, seed: FLEET_SEED };
    const list = [...packs.values()];
    // One joint sampling: each fleet's band and the total's come from the same samples.
    const { total, parts } = sampleFleetParts(
      list.map((p) => p.pack),
      options,
    );
    const row = (fleetId: number | null, flights: number, u: FleetUncertainty): FleetPercentileRow => ({
      fleetId,
      flights,
      flightsSampled: u.flights,
      noxAboveTropopauseKg: u.noxAboveTropopauseKg,
      fractionAboveTropopause: u.fractionAboveTropopause,
      ozoneLossKg: u.ozoneLossKg,
    });
    const counts = new Map<string, number>();
    for (const r of refs) counts.set(fleetKeyOf(r.fleetId), (counts.get(fleetKeyOf(r.fleetId)) ?? 0) + 1);
    const fleets = list.map((p, i) => row(p.fleetId, counts.get(fleetKeyOf(p.fleetId)) ?? 0, parts[i]));
    const sampled = total.flights;
    const correlation = total.correlation;
    const t = row(null, refs.length, total);
    const result: FleetPercentiles = {
      samples: FLEET_SAMPLES,
      seed: FLEET_SEED,
      engineVersion: ENGINE_VERSION,
      fleets,
      total: { ...t, fleetId: null },
      flightsLeftOut: refs.length - sampled,
      correlation,
      note: FLEET_PERCENTILES_NOTE,
    };
    await putFleetPercentiles(scope, key, JSON.stringify(result));
    return result;
  })();
  inFlight.set(memo, work);
  try {
    return await work;
  } finally {
    inFlight.delete(memo);
  }
}
