'use client';

import { useRef, useState, type ReactNode } from 'react';
import { useRouter } from 'next/navigation';
import { useMutation } from '@tanstack/react-query';
import type { ImportDto } from '@/db/imports';
import type { ImportProblem } from '@/lib/validation/imports';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ImportProblemsTable } from './problems-table';

type Outcome =
  | { kind: 'accepted'; imp: ImportDto }
  | { kind: 'refused'; message: string; problems: ImportProblem[]; total: number; warnings: ImportProblem[] }
  | { kind: 'error'; status: number; message: string };

interface ErrorBody {
  error?: { message?: string };
  problems?: ImportProblem[];
  problemCount?: number;
  warnings?: ImportProblem[];
}

async function upload(slug: string, file: File): Promise<Outcome> {
  const form = new FormData();
  form.set('file', file);
  let res: Response;
  try {
    res = await fetch(`/api/v1/workspaces/${slug}/imports`, { method: 'POST', body: form, credentials: 'same-origin' });
  } catch {
    return { kind: 'error', status: 0, message: 'The upload did not reach the server. Check the connection and try again.' };
  }
  const body = (await res.json().catch(() => null)) as (ImportDto & ErrorBody) | null;
  if (res.status === 202 && body) return { kind: 'accepted', imp: body };
  if (res.status === 422 && body?.problems) {
    return { kind: 'refused', message: body.error?.message ?? 'Some rows need attention.', problems: body.problems, total: body.problemCount ?? body.problems.length, warnings: body.warnings ?? [] };
  }
  return { kind: 'error', status: res.status, message: body?.error?.message ?? `The upload failed (HTTP ${res.status}). Try again.` };
}

/** Upload a schedule: the whole file is checked first; on refusal the problems are listed by line and column. */
export function UploadForm({ slug, aside }: { slug: string; aside?: ReactNode }) {
  const router = useRouter();
  const formRef = useRef<HTMLFormElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [missing, setMissing] = useState(false);
  const mutation = useMutation({
    mutationFn: (f: File) => upload(slug, f),
    onSuccess: (outcome) => {
      if (outcome.kind === 'accepted') {
        formRef.current?.reset();
        setFile(null);
        router.refresh();
      }
    },
  });
  const outcome = mutation.data;
  return (
    <form
      ref={formRef}
      noValidate
      className="space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        if (!file) {
          setMissing(true);
          return;
        }
        mutation.mutate(file);
      }}
    >
      <div className="grid gap-6 md:grid-cols-2">
        <div className="space-y-4">
          <Field id="schedule-file" label="Schedule file (CSV)" hint="Every row is checked before anything is saved." error={missing ? 'Choose a CSV file first.' : undefined}>
            <input
              id="schedule-file"
              name="file"
              type="file"
              accept=".csv,text/csv"
              aria-invalid={missing || undefined}
              aria-describedby={missing ? 'schedule-file-error' : 'schedule-file-hint'}
              onChange={(e) => {
                setFile(e.target.files?.[0] ?? null);
                setMissing(false);
                mutation.reset();
              }}
              className="block w-full text-sm text-ink file:mr-3 file:rounded-md file:border file:border-line-strong file:bg-paper-raised file:px-3 file:py-1.5 file:text-sm file:font-medium file:text-ink hover:file:bg-paper-sunk"
            />
          </Field>
          <Button type="submit" disabled={mutation.isPending}>
            {mutation.isPending ? 'Checking every row…' : 'Check and import'}
          </Button>
        </div>
        {aside ? <div className="min-w-0 border-line md:border-l md:pl-6">{aside}</div> : null}
      </div>
      <div aria-live="polite" className="space-y-3">
        {outcome?.kind === 'accepted' ? (
          <Notice tone="success" role="status" title={`Accepted: ${outcome.imp.rows.toLocaleString('en-GB')} flight${outcome.imp.rows === 1 ? '' : 's'} queued for screening`}>
            <p>Progress shows in the list below. Each flight screened is one billable unit.</p>
            {outcome.imp.problems.length ? (
              <div className="mt-3">
                <p className="mb-1 font-medium">Noted, not refused:</p>
                <ImportProblemsTable problems={outcome.imp.problems} caption="Notes on the accepted file" heading="Note" />
              </div>
            ) : null}
          </Notice>
        ) : null}
        {outcome?.kind === 'refused' ? (
          <div className="space-y-3">
            <Notice tone="danger" role="alert" title="Nothing was imported">
              {outcome.message}
            </Notice>
            <ImportProblemsTable problems={outcome.problems} total={outcome.total} caption="Problems in the uploaded file" />
            {outcome.warnings.length ? (
              <div>
                <p className="mb-1 text-sm font-medium">Also noted:</p>
                <ImportProblemsTable problems={outcome.warnings} caption="Notes on the uploaded file" heading="Note" />
              </div>
            ) : null}
          </div>
        ) : null}
        {outcome?.kind === 'error' ? (
          <Notice tone={outcome.status === 409 ? 'caution' : 'danger'} role="alert" title={outcome.status === 409 ? 'Already imported' : 'Not imported'}>
            {outcome.message}
          </Notice>
        ) : null}
      </div>
    </form>
  );
}
