'use client';

import { Notice } from '@/components/ui/notice';
import type { AuthFormState } from './actions';

/** The field's error from a posted form's state. */
export function fieldError(state: AuthFormState, path: string): string | undefined {
  return state && !state.ok ? state.error.fields?.find((f) => f.path === path)?.message : undefined;
}

/** The form-level message: shown when no field carries it. */
export function FormMessage({ state }: { state: AuthFormState }) {
  if (!state || state.ok) return null;
  const onField = state.error.fields?.some((f) => f.message === state.error.message);
  if (onField || (state.error.fields?.length && state.error.code === 'invalid_fields')) return null;
  return (
    <Notice tone="danger" role="alert">
      {state.error.message}
    </Notice>
  );
}
