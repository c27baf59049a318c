'use client';

import type { ReactNode } from 'react';
import type { ImportDto } from '@/db/imports';
import type { ImportProblem } from '@/lib/validation/imports';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ProblemsTable } from '@/components/ui/problems-table';
import { formatMoney } from '@/lib/format';
import type { ImportEstimate } from '@/lib/billing/budget';
import { CsvFileField, useCsvUpload } from './csv-file-field';

/** The dry run's answer: what importing the file would cost, and notes on it. */
type Estimate = ImportEstimate & { rows: number; warnings: ImportProblem[] };

type Outcome =
  | { kind: 'estimate'; estimate: Estimate; file: File }
  | { kind: 'accepted'; imp: ImportDto }
  | { kind: 'refused'; message: string; problems: ImportProblem[]; total: number; warnings: ImportProblem[] }
  | { kind: 'error'; status: number; message: string };

interface ErrorBody {
  error?: { message?: string };
  problems?: ImportProblem[];
  problemCount?: number;
  warnings?: ImportProblem[];
}

async function upload(slug: string, file: File, dryRun: boolean): Promise<Outcome> {
  const form = new FormData();
  form.set('file', file);
  let res: Response;
  try {
    res = await fetch(`/api/v1/workspaces/${slug}/imports${dryRun ? '?dryRun=1' : ''}`, {
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
  const body = (await res.json().catch(() => null)) as (ImportDto & ErrorBody) | null;
  if (dryRun && res.status === 200 && body) return { kind: 'estimate', estimate: body as unknown as Estimate, file };
  if (res.status === 202 && body) return { kind: 'accepted', imp: body };
  if (res.status === 422 && body?.problems) {
    return {
      kind: 'refused',
      message: body.error?.message ?? 'Some rows need attention.',
      problems: body.problems,
      total: body.problemCount ?? body.problems.length,
      warnings: body.warnings ?? [],
    };
  }
  return {
    kind: 'error',
    status: res.status,
    message: body?.error?.message ?? `The upload failed (HTTP ${res.status}). Try again.`,
  };
}

/** What the import will cost, asked before anything is saved. */
function ConfirmImport({
  estimate,
  pending,
  onConfirm,
  onCancel,
}: {
  estimate: Estimate;
  pending: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const n = estimate.billableUnits.toLocaleString('en-GB');
  const blocked = estimate.budget?.wouldExceed && estimate.budget.hardStop;
  return (
    <Notice
      tone={estimate.budget?.wouldExceed ? 'caution' : 'info'}
      role="status"
      title={`Every row is good: ${estimate.rows.toLocaleString('en-GB')} flight${estimate.rows === 1 ? '' : 's'} ready to import`}
    >
      <p data-testid="import-estimate">
        Importing adds up to {n} billable unit{estimate.billableUnits === 1 ? '' : 's'} (one per flight screened)
        {estimate.freePeriod
          ? ', free during the trial.'
          : `: an estimated ${formatMoney(estimate.estimatedChargeCents)} at ${formatMoney(estimate.perFlightCents)} a flight, on top of this period's charges.`}
      </p>
      {estimate.budget ? (
        <p className="mt-1">
          Monthly usage budget {formatMoney(estimate.budget.budgetCents)}:{' '}
          {formatMoney(estimate.budget.usageChargeCents)} used so far, {formatMoney(estimate.budget.afterImportCents)}{' '}
          after this import.
          {estimate.budget.wouldExceed
            ? blocked
              ? ' This passes the budget and its hard stop is on, so the import would be refused; a finance admin or owner can raise the budget.'
              : ' This passes the budget.'
            : ''}
        </p>
      ) : null}
      <div className="mt-3 flex flex-wrap gap-2">
        <Button onClick={onConfirm} disabled={pending || !!blocked}>
          {pending ? 'Importing…' : `Import ${n} flight${estimate.rows === 1 ? '' : 's'}`}
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={pending}>
          Cancel
        </Button>
      </div>
    </Notice>
  );
}

/** Upload a schedule: the whole file is checked first; on refusal the problems are listed by line and column. */
export function UploadForm({ slug, aside }: { slug: string; aside?: ReactNode }) {
  const { formRef, missing, mutation, onFile, onSubmit } = useCsvUpload(({ f, dryRun }: { f: File; dryRun: boolean }) =>
    upload(slug, f, dryRun),
  );
  const outcome = mutation.data;
  return (
    <form ref={formRef} noValidate className="space-y-4" onSubmit={onSubmit((f) => ({ f, dryRun: true }))}>
      <div className="grid gap-6 md:grid-cols-2">
        <div className="space-y-4">
          <CsvFileField
            id="schedule-file"
            label="Schedule file (CSV)"
            hint="Every row is checked before anything is saved."
            missing={missing}
            onFile={onFile}
          />
          <Button type="submit" disabled={mutation.isPending}>
            {mutation.isPending ? 'Checking every row…' : 'Check the file'}
          </Button>
        </div>
        {aside ? <div className="min-w-0 border-line md:border-l md:pl-6">{aside}</div> : null}
      </div>
      <div aria-live="polite" className="space-y-3">
        {outcome?.kind === 'estimate' ? (
          <ConfirmImport
            estimate={outcome.estimate}
            pending={mutation.isPending}
            onConfirm={() => mutation.mutate({ f: outcome.file, dryRun: false })}
            onCancel={() => mutation.reset()}
          />
        ) : null}
        {outcome?.kind === 'accepted' ? (
          <Notice
            tone="success"
            role="status"
            title={`Accepted: ${outcome.imp.rows.toLocaleString('en-GB')} flight${outcome.imp.rows === 1 ? '' : 's'} queued for screening`}
          >
            <p>Progress shows in the list below. Each flight screened is one billable unit.</p>
            {outcome.imp.problems.length ? (
              <div className="mt-3">
                <p className="mb-1 font-medium">Noted, not refused:</p>
                <ProblemsTable problems={outcome.imp.problems} caption="Notes on the accepted file" heading="Note" />
              </div>
            ) : null}
          </Notice>
        ) : null}
        {outcome?.kind === 'refused' ? (
          <div className="space-y-3">
            <Notice tone="danger" role="alert" title="Nothing was imported">
              {outcome.message}
            </Notice>
            <ProblemsTable problems={outcome.problems} total={outcome.total} caption="Problems in the uploaded file" />
            {outcome.warnings.length ? (
              <div>
                <p className="mb-1 text-sm font-medium">Also noted:</p>
                <ProblemsTable problems={outcome.warnings} caption="Notes on the uploaded file" heading="Note" />
              </div>
            ) : null}
          </div>
        ) : null}
        {outcome?.kind === 'error' ? (
          <Notice
            tone={outcome.status === 409 ? 'caution' : 'danger'}
            role="alert"
            title={outcome.status === 409 ? 'Already imported' : 'Not imported'}
          >
            {outcome.message}
          </Notice>
        ) : null}
      </div>
    </form>
  );
}
