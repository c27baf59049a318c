import 'server-only';
import { createHash } from 'node:crypto';
import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import {
  forEachFlightComponents,
  getFleetPercentiles,
  listFleetFlightRefs,
  listFlightInputs,
  putFleetPercentiles,
  storeFlightComponents,
  type ComponentsRow,
} from '@/db/flight-components';
import type { FlightFilters } from '@/db/fleets';
import {
  ENGINE_VERSION,
  FleetPack,
  sampleFleetParts,
  screenWithComponents,
  type FleetUncertainty,
  type ScreeningInput,
} from '@/lib/screening';
import { FLEET_PERCENTILES_NOTE } from './percentiles-note';
import type { FleetPercentiles, FleetPercentileRow } from './types';

/** Samples and seed of every fleet percentile in the product: fixed, so a figure can be reproduced. */
export const FLEET_SAMPLES = 400;
export const FLEET_SEED = 1;

export { FLEET_PERCENTILES_NOTE };

/**
 * Components are built lazily for flights screened before they were kept (or by an older engine):
 * in chunks of this many flights, each chunk stored in its own transaction, so the work is done once
 * and an abandoned request keeps what it built.
 */
const LAZY_CHUNK = 500;

const fleetKeyOf = (id: number | null) => (id === null ? 'none' : String(id));

/** Builds and stores components for flights that have none current; returns how many could not be built. */
async function buildMissing(scope: { workspaceId: number }, ids: number[]): Promise<number> {
  let failed = 0;
  for (let i = 0; i < ids.length; i += LAZY_CHUNK) {
    const inputs = await listFlightInputs(scope, ids.slice(i, i + LAZY_CHUNK));
    const rows: ComponentsRow[] = [];
    for (const f of inputs) {
      try {
        const { totals, components } = screenWithComponents(JSON.parse(f.inputJson) as ScreeningInput);
        // Only components of the engine that made the flight's figures are used (see forEachFlightComponents).
        if (components && totals.engineVersion === ENGINE_VERSION)
          rows.push({
            flightId: f.id,
            workspaceId: scope.workspaceId,
            engineVersion: totals.engineVersion,
            data: components,
          });
        else failed += 1;
      } catch {
        failed += 1;
      }
    }
    await storeFlightComponents(rows);
    await yieldToEventLoop();
  }
  return failed;
}

const inFlight = new Map<string, Promise<FleetPercentiles>>();

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
): Promise<FleetPercentiles | null> {
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
    const stale = refs.filter((r) => !r.current && r.engineVersion === ENGINE_VERSION).map((r) => r.id);
    if (stale.length) await buildMissing(scope, stale);
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
