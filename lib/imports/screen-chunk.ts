import type { PendingFlight, ScreenedOutcome } from '@/db/imports';
import { screenTotals, ScreeningInputError, type ScreeningInput } from '@/lib/screening';
import { figuresOf } from './figures';

/**
 * Screens a chunk of pending flights one by one, each to its figures or to the reason it could not
 * be screened. No `server-only`: the import worker runs it on the event loop and the screening
 * threads (thread-tasks.ts) run it too.
 */

export function reasonOf(err: unknown): string {
  if (err instanceof ScreeningInputError)
    return err.fields.map((f) => `${f.path}: ${f.message}`).join('; ') || err.message;
  if (err instanceof Error) return err.message;
  return 'the screening engine could not screen this flight';
}

export function screenChunk(pending: readonly PendingFlight[]): ScreenedOutcome[] {
  return pending.map((p) => {
    try {
      const input = JSON.parse(p.inputJson) as ScreeningInput;
      // Only the summary figures leave this function: the full result (its segments) dies young.
      return { id: p.id, workspaceId: p.workspaceId, line: p.line, figures: figuresOf(screenTotals(input)) };
    } catch (err) {
      return { id: p.id, workspaceId: p.workspaceId, line: p.line, error: reasonOf(err) };
    }
  });
}
