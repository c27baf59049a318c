'use client';

import { useRef, useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { postUpload } from './upload';
import { CsvFileInput, UploadOutcomeNotice, type LibraryUploadOutcome } from './upload-parts';

const KINDS = {
  fixes: {
    label: 'Fixes CSV',
    columns: 'name, lat, lon (decimal degrees), optional region to tell same-named points apart',
    file: 'fixes-template.csv',
    button: 'Upload fixes',
  },
  airways: {
    label: 'Airways CSV',
    columns: 'airway, sequence, fix: one row per point, in any order; an airway already here is replaced',
    file: 'airways-template.csv',
    button: 'Upload airways',
  },
} as const;

/** Uploads a fix or airway CSV to the workspace library; problems come back by line and column. */
export function RouteLibraryUploadForm({
  slug,
  kind,
  templateHref,
}: {
  slug: string;
  kind: keyof typeof KINDS;
  templateHref: string;
}) {
  const router = useRouter();
  const file = useRef<HTMLInputElement>(null);
  const [busy, setBusy] = useState(false);
  const [fileError, setFileError] = useState<string>();
  const [outcome, setOutcome] = useState<LibraryUploadOutcome>();
  const k = KINDS[kind];
  return (
    <form
      noValidate
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        setOutcome(undefined);
        const chosen = file.current?.files?.[0];
        if (!chosen) {
          setFileError('Choose the CSV file.');
          return;
        }
        setFileError(undefined);
        setBusy(true);
        const body = new FormData();
        body.set('file', chosen);
        const out = await postUpload<{ added: number; updated: number }>(
          `/api/v1/workspaces/${slug}/${kind}/upload`,
          body,
        );
        setBusy(false);
        if (out.ok && out.body) {
          setOutcome({
            ok: true,
            text: `${out.body.added} added, ${out.body.updated} ${kind === 'fixes' ? 'moved' : 'replaced'}.`,
            problems: [],
            warnings: out.warnings,
          });
          if (file.current) file.current.value = '';
          router.refresh();
          return;
        }
        setOutcome({ ok: false, text: out.message, problems: out.problems, warnings: out.warnings });
      }}
    >
      <CsvFileInput
        ref={file}
        id={`${kind}-file`}
        label={k.label}
        error={fileError}
        hint={
          <>
            {k.columns}.{' '}
            <a href={templateHref} download={k.file} className="text-accent underline">
              Download a template
            </a>
            .
          </>
        }
      />
      <Button type="submit" disabled={busy}>
        {busy ? 'Uploading…' : k.button}
      </Button>
      {outcome ? <UploadOutcomeNotice outcome={outcome} caption="Problems in the file" /> : null}
    </form>
  );
}

/** Deletes one fix or airway through the API after a confirmation, then refreshes the page. */
export function RouteLibraryDeleteButton({ url, name }: { url: string; name: string }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [error, setError] = useState<string>();
  return (
    <span className="inline-flex flex-col items-end gap-1">
      <button
        type="button"
        className="text-xs text-danger underline disabled:opacity-50"
        disabled={pending}
        aria-label={`Delete ${name}`}
        onClick={() => {
          if (!window.confirm(`Delete ${name}? Flight plans that name it will list it as not found.`)) return;
          start(async () => {
            setError(undefined);
            const res = await fetch(url, { method: 'DELETE', credentials: 'same-origin' }).catch(() => null);
            if (!res || !res.ok) setError('Could not delete it; try again.');
            else router.refresh();
          });
        }}
      >
        {pending ? 'Deleting…' : 'Delete'}
      </button>
      {error ? (
        <span role="alert" className="text-xs text-danger">
          {error}
        </span>
      ) : null}
    </span>
  );
}
