'use client';

import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import type { ActionState } from '@/lib/errors';

/** Puts a server action's field problems beside their fields; returns the general message, if any. */
export function applyServerErrors<T extends FieldValues>(
  state: ActionState<unknown>,
  setError: UseFormSetError<T>,
  known: readonly string[],
): string | undefined {
  if (!state || state.ok) return undefined;
  let unplaced = false;
  for (const f of state.error.fields ?? []) {
    if (known.includes(f.path)) setError(f.path as Path<T>, { type: 'server', message: f.message });
    else unplaced = true;
  }
  return !state.error.fields?.length || unplaced ? state.error.message : undefined;
}
