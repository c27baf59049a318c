'use client';

import type { ImportProblem } from '@/lib/validation/imports';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ProblemsTable } from '@/components/ui/problems-table';
import { CsvFileField, useCsvUpload } from './csv-file-field';

type Outcome =
  | { kind: 'accepted'; flights: number; points: number }
  | { kind: 'refused'; message: string; problems: ImportProblem[]; total: number }
  | { kind: 'error'; status: number; message: string };

interface Body {
  rows?: number;
  points?: number;
  error?: { message?: string };
  problems?: ImportProblem[];
  problemCount?: number;
}

async function upload(slug: string, file: File): Promise<Outcome> {
  const form = new FormData();
  form.set('file', file);
  let res: Response;
  try {
    res = await fetch(`/api/v1/workspaces/${slug}/imports/tracks`, {
      method: 'POST',
      body: form,
      credentials: 'same-origin',
    });
  } catch {
    return {
      kind: 'error',
      status: 0,
      message: 'The upload did not reach the server. Check the connection and try again.',
    };
  }
  const body = (await res.json().catch(() => null)) as Body | null;
  if (res.status === 202 && body) return { kind: 'accepted', flights: body.rows ?? 0, points: body.points ?? 0 };
  if (res.status === 422 && body?.problems)
    return {
      kind: 'refused',
      message: body.error?.message ?? 'Some points need attention.',
      problems: body.problems,
      total: body.problemCount ?? body.problems.length,
    };
  return {
    kind: 'error',
    status: res.status,
    message: body?.error?.message ?? `The upload failed (HTTP ${res.status}).`,
  };
}

/** Upload a flown-track file: every point is checked first; refused files list their problems by line and column. */
export function TrackUploadForm({ slug }: { slug: string }) {
  const { formRef, missing, mutation, onFile, onSubmit } = useCsvUpload((f: File) => upload(slug, f));
  const outcome = mutation.data;
  return (
    <form ref={formRef} noValidate className="space-y-4" onSubmit={onSubmit((f) => f)}>
      <CsvFileField
        id="track-file"
        label="Track file (CSV)"
        hint="Every point is checked before anything is saved; each flight is one billable unit once screened."
        missing={missing}
        onFile={onFile}
      />
      <Button type="submit" disabled={mutation.isPending}>
        {mutation.isPending ? 'Checking every point…' : 'Upload the tracks'}
      </Button>
      <div aria-live="polite" className="space-y-3">
        {outcome?.kind === 'accepted' ? (
          <Notice
            tone="success"
            role="status"
            title={`Accepted: ${outcome.flights.toLocaleString('en-GB')} flown flight${outcome.flights === 1 ? '' : 's'} (${outcome.points.toLocaleString('en-GB')} points) queued for screening`}
          >
            Progress shows in the list below; each flight opens from Flights, beside its plan when there is one.
          </Notice>
        ) : null}
        {outcome?.kind === 'refused' ? (
          <div className="space-y-3">
            <Notice tone="danger" role="alert" title="Nothing was imported">
              {outcome.message}
            </Notice>
            <ProblemsTable problems={outcome.problems} total={outcome.total} caption="Problems in the track file" />
          </div>
        ) : null}
        {outcome?.kind === 'error' ? (
          <Notice tone={outcome.status === 409 ? 'caution' : 'danger'} role="alert" title="Not imported">
            {outcome.message}
          </Notice>
        ) : null}
      </div>
    </form>
  );
}
