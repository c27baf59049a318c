'use client';

import { useRef, useState, type FormEvent } from 'react';
import { useRouter } from 'next/navigation';
import { useMutation } from '@tanstack/react-query';
import { Field } from '@/components/ui/field';

/**
 * The state of a CSV upload form: the chosen file, "no file chosen" after a submit without one, and
 * the upload itself; an accepted upload clears the form and refreshes the page's lists.
 */
export function useCsvUpload<TVars, TOutcome extends { kind: string }>(send: (vars: TVars) => Promise<TOutcome>) {
  const router = useRouter();
  const formRef = useRef<HTMLFormElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [missing, setMissing] = useState(false);
  const mutation = useMutation({
    mutationFn: send,
    onSuccess: (outcome) => {
      if (outcome.kind === 'accepted') {
        formRef.current?.reset();
        setFile(null);
        router.refresh();
      }
    },
  });
  const onFile = (f: File | null) => {
    setFile(f);
    setMissing(false);
    mutation.reset();
  };
  /** The form's submit handler: asks for a file first, else uploads it with `vars`. */
  const onSubmit = (vars: (f: File) => TVars) => (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    if (!file) {
      setMissing(true);
      return;
    }
    mutation.mutate(vars(file));
  };
  return { formRef, missing, mutation, onFile, onSubmit };
}

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
