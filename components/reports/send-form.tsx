'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { MAX_RECIPIENTS, reportSendFormSchema, type ReportSendForm as FormValues } from '@/lib/validation/reports';
import type { ActionState } from '@/lib/errors';
import { Button } from '@/components/ui/button';
import { Field, TextArea, TextInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';

interface Props {
  slug: string;
  reportId: number;
  action: (slug: string, reportId: unknown, raw: unknown) => Promise<ActionState>;
}

/** Recipients typed in one box (commas, spaces or new lines), an optional note; the PDF goes attached. */
export function ReportSendForm({ slug, reportId, action }: Props) {
  const [message, setMessage] = useState<{ tone: 'success' | 'danger'; text: string }>();
  const form = useForm<FormValues>({
    resolver: zodResolver(reportSendFormSchema),
    defaultValues: { recipientsText: '', note: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setMessage(undefined);
    const state = await action(slug, reportId, values);
    if (state?.ok) {
      setMessage({ tone: 'success', text: state.message ?? 'Sent.' });
      form.reset({ recipientsText: '', note: '' });
      return;
    }
    if (!state) return;
    const recipientProblem = state.error.fields?.find(
      (f) => f.path === 'recipients' || f.path.startsWith('recipients.') || f.path === 'recipientsText',
    );
    if (recipientProblem) form.setError('recipientsText', { type: 'server', message: recipientProblem.message });
    else setMessage({ tone: 'danger', text: state.error.message });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Send the report by e-mail">
      {message ? (
        <Notice tone={message.tone} role="status">
          {message.text}
        </Notice>
      ) : null}
      <Field
        id="send-recipients"
        label="Recipients"
        error={errors.recipientsText?.message}
        hint={`E-mail addresses separated by commas or new lines, at most ${MAX_RECIPIENTS}.`}
      >
        <TextArea
          id="send-recipients"
          rows={3}
          invalid={!!errors.recipientsText}
          placeholder="sustainability@example.com, board@example.com"
          {...form.register('recipientsText')}
        />
      </Field>
      <Field id="send-note" label="Note (optional)" error={errors.note?.message}>
        <TextInput id="send-note" invalid={!!errors.note} {...form.register('note')} />
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Sending…' : 'Send the PDF'}
      </Button>
    </form>
  );
}
