'use client';

import { useActionState, useState } from 'react';
import { useForm, type DefaultValues, type FieldValues, type Resolver, type UseFormReturn } from 'react-hook-form';
import type { ActionState } from '@/lib/errors';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/server-errors';

/** A form's message above its fields: a success note or a problem no field carries. */
export type FormMessage = { tone: 'success' | 'danger'; text: string };

type Success<TData> = { ok: true; data?: TData; message?: string };

/**
 * A typed form whose submit calls a server action: client-side checks by `resolver`, the action's field
 * problems put beside the fields named in `fields`, anything else as the form's message.
 * `onSuccess` returns the text to show (a string), nothing to show nothing (it navigated), or is left out
 * for the action's own message or `successText`.
 */
export function useActionForm<TIn extends FieldValues, TOut, TData>({
  resolver,
  defaultValues,
  fields,
  action,
  onSuccess,
  onSettled,
  successText = 'Saved.',
  initialMessage,
}: {
  resolver?: Resolver<TIn, unknown, TOut>;
  defaultValues: DefaultValues<TIn>;
  fields: readonly string[];
  action: (values: TOut) => Promise<ActionState<TData>>;
  onSuccess?: (state: Success<TData>, values: TOut) => string | void | Promise<string | void>;
  /** Runs after every answer, success or not (refreshing what the action may have changed). */
  onSettled?: () => unknown;
  successText?: string;
  initialMessage?: FormMessage;
}): {
  form: UseFormReturn<TIn, unknown, TOut>;
  errors: UseFormReturn<TIn, unknown, TOut>['formState']['errors'];
  pending: boolean;
  message: FormMessage | undefined;
  setMessage: (message: FormMessage | undefined) => void;
  onSubmit: (event?: React.BaseSyntheticEvent) => Promise<void>;
} {
  const [message, setMessage] = useState<FormMessage | undefined>(initialMessage);
  const form = useForm<TIn, unknown, TOut>({ resolver, defaultValues });
  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await action(values);
    if (state?.ok) {
      const text = onSuccess ? await onSuccess(state, values) : (state.message ?? successText);
      if (text) setMessage({ tone: 'success', text });
    } else {
      const text = applyServerErrors(state, form.setError, fields);
      if (text) setMessage({ tone: 'danger', text });
    }
    await onSettled?.();
  });
  return {
    form,
    errors: form.formState.errors,
    pending: form.formState.isSubmitting,
    message,
    setMessage,
    onSubmit,
  };
}

/**
 * A form posted as an ordinary form (a server action through `useActionState`, so it works before the
 * script loads): the state, the bound action, pending, the field problem by path, and the form-level
 * message (shown only when no field carries it).
 */
export function usePostedForm<TState extends ActionState<unknown>>(
  action: (state: Awaited<TState>, data: FormData) => Promise<TState>,
  initial: Awaited<TState>,
) {
  const [state, formAction, pending] = useActionState<TState, FormData>(action, initial);
  const fieldError = (path: string): string | undefined =>
    state && !state.ok ? state.error.fields?.find((f) => f.path === path)?.message : undefined;
  let message: string | undefined;
  if (state && !state.ok) {
    const onField = state.error.fields?.some((f) => f.message === state.error.message);
    const fieldsOnly = !!state.error.fields?.length && state.error.code === 'invalid_fields';
    if (!onField && !fieldsOnly) message = state.error.message;
  }
  return { state, action: formAction, pending, fieldError, message };
}

/** The message of a form: success as a status, a problem as an alert. */
export function FormNotice({ message }: { message: FormMessage | string | undefined }) {
  if (!message) return null;
  const m = typeof message === 'string' ? { tone: 'danger' as const, text: message } : message;
  return (
    <Notice tone={m.tone} role={m.tone === 'danger' ? 'alert' : 'status'}>
      {m.text}
    </Notice>
  );
}
