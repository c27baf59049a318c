'use client';

import { Field } from '@/components/ui/field';

/** The CSV file chooser of an upload form, with its "choose a file first" problem. */
export function CsvFileField({
  id,
  label,
  hint,
  missing,
  onFile,
}: {
  id: string;
  label: string;
  hint: string;
  missing: boolean;
  onFile: (file: File | null) => void;
}) {
  return (
    <Field id={id} label={label} hint={hint} error={missing ? 'Choose a CSV file first.' : undefined}>
      <input
        id={id}
        name="file"
        type="file"
        accept=".csv,text/csv"
        aria-invalid={missing || undefined}
        aria-describedby={missing ? `${id}-error` : `${id}-hint`}
        onChange={(e) => onFile(e.target.files?.[0] ?? null)}
        className="block w-full text-sm text-ink file:mr-3 file:rounded-md file:border file:border-line-strong file:bg-paper-raised file:px-3 file:py-1.5 file:text-sm file:font-medium file:text-ink hover:file:bg-paper-sunk"
      />
    </Field>
  );
}
