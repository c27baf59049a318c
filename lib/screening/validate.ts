import type { z } from 'zod';
import { ScreeningInputError } from './errors';
import { withTrackCruise } from './track';
import {
  compareCruiseLevelsOptionsSchema,
  screeningInputSchema,
  type FieldProblem,
  type ScreeningInput,
} from '../validation/screening';

type Issue = z.core.$ZodIssue;

function joinPath(path: readonly PropertyKey[]): string {
  return path.map((p) => String(p)).join('.');
}

function isRootMismatch(branch: readonly Issue[]): boolean {
  return branch.some((i) => i.path.length === 0 && (i.code === 'unrecognized_keys' || i.code === 'invalid_type'));
}

function collect(issues: readonly Issue[], prefix: readonly PropertyKey[], out: FieldProblem[]): void {
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    if (issue.code === 'invalid_union' && issue.errors.length > 0) {
      // The input's own keys say which form was meant: report that form's problems by field.
      const candidates = issue.errors.filter((b) => !isRootMismatch(b));
      if (candidates.length === 1) {
        collect(candidates[0], path, out);
        continue;
      }
      // A form whose only complaint is a missing top-level key loses to one that has its key.
      const present = candidates.filter((b) => !b.every((i) => i.code === 'invalid_type' && i.path.length === 1));
      if (candidates.length > 1 && present.length === 1) {
        collect(present[0], path, out);
        continue;
      }
    }
    if (issue.code === 'unrecognized_keys') {
      const keys = issue.keys.map((k) => `"${k}"`).join(', ');
      out.push({
        path: joinPath(path),
        message: `Unknown field${issue.keys.length > 1 ? 's' : ''} ${keys}: remove or rename it.`,
      });
      continue;
    }
    out.push({ path: joinPath(path), message: issue.message });
  }
}

/** Zod issues as field problems with dotted paths and plain messages. */
export function problemsFromZod(issues: readonly Issue[], prefix: readonly PropertyKey[] = []): FieldProblem[] {
  const out: FieldProblem[] = [];
  collect(issues, prefix, out);
  return out;
}

/**
 * Validates a raw screening input against `screeningInputSchema` and returns the parsed input.
 * Throws ScreeningInputError listing every bad field (dotted path, plain message). Airports are
 * checked later, when the engine resolves them. A track without a cruise takes its first level.
 */
export function validateScreeningInput(raw: unknown): ScreeningInput {
  const r = screeningInputSchema.safeParse(withTrackCruise(raw));
  if (r.success) return r.data;
  throw new ScreeningInputError(problemsFromZod(r.error.issues));
}

/** Validated `compareCruiseLevels` options; problems are reported under `options.`. */
export function validateCompareOptions(raw: unknown): z.output<typeof compareCruiseLevelsOptionsSchema> {
  const r = compareCruiseLevelsOptionsSchema.safeParse(raw ?? {});
  if (r.success) return r.data;
  throw new ScreeningInputError(problemsFromZod(r.error.issues, ['options']));
}
