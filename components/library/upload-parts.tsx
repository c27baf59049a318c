import type { InputHTMLAttributes, ReactNode, Ref } from 'react';
import { Field } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ProblemsTable } from '@/components/ui/problems-table';
import type { LineProblem } from '@/lib/validation/problems';

/** What an upload to the library answered: a sentence, and the file's problems and ignored columns. */
export interface LibraryUploadOutcome {
  ok: boolean;
  text: string;
  problems: LineProblem[];
  warnings: LineProblem[];
}

/**
 * A labelled CSV file input with its error, or its hint while there is none; the input is described
 * by whichever is shown.
 */
export function CsvFileInput({
  id,
  label,
  error,
  hint,
  ...input
}: Omit<InputHTMLAttributes<HTMLInputElement>, 'id' | 'type'> & {
  id: string;
  label: string;
  error?: string;
  hint?: ReactNode;
  ref?: Ref<HTMLInputElement>;
}) {
  return (
    <Field id={id} label={label} hint={hint} error={error}>
      <input
        {...input}
        id={id}
        type="file"
        accept=".csv,text/csv"
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
        className="block w-full text-sm file:mr-3 file:rounded-md file:border file:border-line-strong file:bg-paper-raised file:px-3 file:py-1.5 file:text-sm"
      />
    </Field>
  );
}

/** The answer to an upload: a notice, then the problems by line and column and the columns ignored. */
export function UploadOutcomeNotice({ outcome, caption }: { outcome: LibraryUploadOutcome; caption: string }) {
  return (
    <div className="space-y-2">
      <Notice tone={outcome.ok ? 'success' : 'danger'} role={outcome.ok ? 'status' : 'alert'}>
        {outcome.text}
      </Notice>
      {outcome.problems.length ? <ProblemsTable problems={outcome.problems} caption={caption} /> : null}
      {outcome.warnings.length ? (
        <ProblemsTable problems={outcome.warnings} caption="Columns that were ignored" />
      ) : null}
    </div>
  );
}
