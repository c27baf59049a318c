import 'server-only';
import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import {
  listFlightsNeedingComponents,
  saveBuiltComponents,
  type ComponentsRow,
  type FlightNeedingComponents,
} from '@/db/flight-components';
import { ENGINE_VERSION, screenWithComponents, type ScreeningInput } from '@/lib/screening';
import { componentsInThreads, type BuiltComponents } from './screening-pool';

/**
 * The fleet-sampling components of screened flights (lib/screening/fleet-uncertainty.ts), built by
 * the import worker once its imports and re-screens are done, so an import's own screening keeps its
 * speed (building them costs several times a flight's totals-only screening). Each chunk is stored in
 * one transaction, only for flights whose figures are still from the engine that built them.
 */

export const COMPONENTS_CHUNK = 500;

function buildOne(f: { id: number; inputJson: string }): BuiltComponents {
  try {
    const { totals, components } = screenWithComponents(JSON.parse(f.inputJson) as ScreeningInput);
    return { id: f.id, engineVersion: totals.engineVersion, components };
  } catch {
    return { id: f.id, engineVersion: ENGINE_VERSION, components: null };
  }
}

/**
 * Components for these flights, on the screening threads or the event loop. A flight whose figures
 * come from another engine version than this one, or whose components cannot be built, gets an empty
 * row for its own version: it is not tried again, and the fleet sampling counts it as left out until
 * its import is re-screened.
 */
export async function buildComponents(
  flights: FlightNeedingComponents[],
  opts: { threads?: boolean } = {},
): Promise<ComponentsRow[]> {
  const items = flights.map((f) => ({ id: f.id, inputJson: f.inputJson }));
  const built = (opts.threads === false ? null : await componentsInThreads(items)) ?? items.map(buildOne);
  const byId = new Map(built.map((b) => [b.id, b]));
  return flights.map((f) => {
    const b = byId.get(f.id);
    const ok = b?.components && b.engineVersion === f.engineVersion;
    return {
      flightId: f.id,
      workspaceId: f.workspaceId,
      engineVersion: f.engineVersion,
      data: ok && b.components ? b.components : new Uint8Array(0),
    };
  });
}

/**
 * Builds the components of every screened flight that lacks current ones, chunk by chunk in id order.
 * Stops early (interrupted) when `yieldTo()` says other work (an import) should go first.
 */
export async function buildComponentBacklog(
  yieldTo: () => Promise<boolean>,
  chunkSize = COMPONENTS_CHUNK,
): Promise<{ built: number; interrupted: boolean }> {
  let after = 0;
  let built = 0;
  for (;;) {
    const flights = await listFlightsNeedingComponents(after, chunkSize);
    if (flights.length === 0) return { built, interrupted: false };
    built += await saveBuiltComponents(await buildComponents(flights));
    after = flights[flights.length - 1].id;
    await yieldToEventLoop();
    if (await yieldTo()) return { built, interrupted: true };
  }
}
