'use client';

import { useEffect, useRef, useState, useTransition } from 'react';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useQuery } from '@tanstack/react-query';
import type { ImportDto } from '@/db/imports';
import type { ActionState } from '@/lib/errors';
import { formatDateTime, formatNumber } from '@/lib/format';
import { Button, buttonClass } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ProblemsTable } from '@/components/ui/problems-table';

const POLL_MS = 1000;
const isActive = (i: ImportDto | undefined) =>
  i?.status === 'queued' ||
  i?.status === 'screening' ||
  i?.rescreen?.status === 'queued' ||
  i?.rescreen?.status === 'running';

const STATUS: Record<ImportDto['status'], { label: string; className: string }> = {
  queued: { label: 'Queued', className: 'border-line-strong bg-paper-sunk text-ink-soft' },
  screening: { label: 'Screening', className: 'border-accent/40 bg-accent-soft text-accent-strong' },
  complete: { label: 'Complete', className: 'border-tropo/40 bg-tropo-soft text-tropo-strong' },
  failed: { label: 'Failed', className: 'border-danger/40 bg-danger-soft text-danger' },
};

/** "about 40 s", "about 3 min". */
export function durationText(seconds: number): string {
  if (seconds < 1) return 'under a second';
  if (seconds < 90) return `about ${Math.round(seconds)} s`;
  return `about ${Math.round(seconds / 60)} min`;
}

class GoneError extends Error {}

async function fetchImport(slug: string, id: number): Promise<ImportDto> {
  const res = await fetch(`/api/v1/workspaces/${slug}/imports/${id}`, {
    credentials: 'same-origin',
    cache: 'no-store',
  });
  if (res.status === 404) throw new GoneError('This import was deleted.');
  if (!res.ok) throw new Error(`Progress could not be read (HTTP ${res.status}); retrying.`);
  return (await res.json()) as ImportDto;
}

function Progress({ imp }: { imp: ImportDto }) {
  const pct = imp.rows ? Math.min(100, (imp.rowsDone / imp.rows) * 100) : 0;
  const parts = [`${formatNumber(imp.rowsDone)} of ${formatNumber(imp.rows)} flights done`];
  if (imp.status === 'screening' && imp.rowsPerSecond) parts.push(`${formatNumber(imp.rowsPerSecond)} rows/s`);
  if (imp.status === 'screening' && imp.secondsLeft !== null) parts.push(`${durationText(imp.secondsLeft)} left`);
  if (imp.status === 'queued') parts.push('waiting for the screening worker');
  return (
    <div>
      <div
        role="progressbar"
        aria-label={`Screening progress of ${imp.fileName}`}
        aria-valuemin={0}
        aria-valuemax={imp.rows}
        aria-valuenow={imp.rowsDone}
        className="h-2 w-full overflow-hidden rounded-full bg-paper-sunk"
      >
        <div
          className={`h-full rounded-full ${imp.status === 'failed' ? 'bg-danger' : 'bg-accent'} transition-[width]`}
          style={{ width: `${pct}%` }}
        />
      </div>
      <p className="figure mt-1 text-xs text-ink-soft" data-testid="import-progress">
        {parts.join(' · ')}
      </p>
    </div>
  );
}

function Summary({ imp }: { imp: ImportDto }) {
  if (imp.status === 'complete') {
    const took =
      imp.startedAt && imp.finishedAt ? (Date.parse(imp.finishedAt) - Date.parse(imp.startedAt)) / 1000 : null;
    return (
      <p className="text-sm text-ink">
        {formatNumber(imp.rowsScreened)} flight{imp.rowsScreened === 1 ? '' : 's'} screened
        {took !== null && took > 0 ? ` in ${durationText(took).replace('about ', '')}` : ''}
        {imp.rowsPerSecond ? ` (${formatNumber(imp.rowsPerSecond)} rows/s)` : ''}
        {imp.rowsFailed
          ? `; ${formatNumber(imp.rowsFailed)} could not be screened and are not billed (see the notes).`
          : '.'}
      </p>
    );
  }
  if (imp.status === 'failed') {
    return (
      <Notice tone="danger" title="Screening stopped">
        {imp.failureReason ?? 'The screening of this import could not finish.'}
      </Notice>
    );
  }
  return <Progress imp={imp} />;
}

function DeleteImport({ imp, onDelete }: { imp: ImportDto; onDelete: (id: number) => Promise<ActionState> }) {
  const [open, setOpen] = useState(false);
  const [pending, start] = useTransition();
  const [error, setError] = useState<string>();
  const confirmRef = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    if (open) confirmRef.current?.focus();
  }, [open]);
  if (!open) {
    return (
      <Button variant="ghost" onClick={() => setOpen(true)} aria-label={`Delete import #${imp.id}`}>
        Delete…
      </Button>
    );
  }
  return (
    <div
      role="group"
      aria-label={`Confirm deleting import #${imp.id}`}
      className="mt-3 w-full rounded-md border border-danger/40 bg-danger-soft p-3 text-sm"
      onKeyDown={(e) => {
        if (e.key === 'Escape' && !pending) setOpen(false);
      }}
    >
      <p>
        Delete import #{imp.id} and its {formatNumber(imp.rows)} flight{imp.rows === 1 ? '' : 's'}? They leave the
        flight list, fleet figures and new reports.{' '}
        <strong>Units already billed for screened flights ({formatNumber(imp.rowsScreened)} so far) stay billed</strong>
        ; deleting does not refund them.
      </p>
      {error ? (
        <p role="alert" className="mt-2 font-medium text-danger">
          {error}
        </p>
      ) : null}
      <div className="mt-3 flex gap-2">
        <button
          type="button"
          ref={confirmRef}
          className={buttonClass('danger')}
          disabled={pending}
          onClick={() =>
            start(async () => {
              setError(undefined);
              const state = await onDelete(imp.id);
              if (state && !state.ok) setError(state.error.message);
            })
          }
        >
          {pending ? 'Deleting…' : 'Delete import and flights'}
        </button>
        <Button variant="secondary" disabled={pending} onClick={() => setOpen(false)}>
          Keep it
        </Button>
      </div>
    </div>
  );
}

/** Which engine versions made the flights' figures, and the re-screen with the current one. */
function EngineVersions({
  imp,
  current,
  canRescreen,
  onRescreen,
}: {
  imp: ImportDto;
  current: string;
  canRescreen: boolean;
  onRescreen: (id: number) => Promise<ActionState>;
}) {
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<{ ok: boolean; text: string }>();
  const versions = imp.engineVersions;
  const stale = versions.filter((v) => v.engineVersion !== current).reduce((n, v) => n + v.flights, 0);
  const r = imp.rescreen;
  const running = r && (r.status === 'queued' || r.status === 'running');
  if (!versions.length && !r) return null;
  return (
    <div className="text-xs text-ink-soft" data-testid="import-engine-versions">
      <p>
        Engine version{versions.length === 1 ? '' : 's'}:{' '}
        {versions
          .map((v) => `${v.engineVersion} (${formatNumber(v.flights)} flight${v.flights === 1 ? '' : 's'})`)
          .join(', ')}
        {stale ? ` · ${formatNumber(stale)} made with an older version than the current ${current}` : ''}
      </p>
      {running ? (
        <p className="mt-1" data-testid="rescreen-progress">
          Screening again with {r.engineVersion}: {formatNumber(r.rowsDone)} of {formatNumber(r.rows)} flights done
          {r.status === 'queued' ? ' (waiting for the worker)' : ''}; not billed again.
        </p>
      ) : r && r.status === 'complete' ? (
        <p className="mt-1" data-testid="rescreen-progress">
          Screened again with {r.engineVersion}: {formatNumber(r.rowsDone)} of {formatNumber(r.rows)} flights
          {r.rowsFailed
            ? `; ${formatNumber(r.rowsFailed)} kept their earlier figures (the current engine could not screen them)`
            : ''}
          .
        </p>
      ) : null}
      {stale && !running && canRescreen && imp.status === 'complete' ? (
        <Button
          variant="secondary"
          className="mt-2"
          disabled={pending}
          onClick={() =>
            start(async () => {
              const state = await onRescreen(imp.id);
              if (state?.ok) setMessage({ ok: true, text: state.message ?? 'Queued.' });
              else if (state) setMessage({ ok: false, text: state.error.message });
            })
          }
        >
          {pending ? 'Queuing…' : `Screen ${formatNumber(stale)} flights again with ${current}`}
        </Button>
      ) : null}
      {message ? (
        <p role={message.ok ? 'status' : 'alert'} className={`mt-1 ${message.ok ? 'text-ink' : 'text-danger'}`}>
          {message.text}
        </p>
      ) : null}
    </div>
  );
}

function ImportItem({
  slug,
  initial,
  canDelete,
  onDelete,
  canRescreen,
  onRescreen,
  currentEngineVersion,
}: {
  slug: string;
  initial: ImportDto;
  canDelete: boolean;
  onDelete: (id: number) => Promise<ActionState>;
  canRescreen: boolean;
  onRescreen: (id: number) => Promise<ActionState>;
  currentEngineVersion: string;
}) {
  const router = useRouter();
  const query = useQuery({
    queryKey: ['import', slug, initial.id],
    queryFn: () => fetchImport(slug, initial.id),
    initialData: initial,
    refetchInterval: (q) => (q.state.error instanceof GoneError ? false : isActive(q.state.data) ? POLL_MS : false),
    retry: (count, err) => !(err instanceof GoneError) && count < 3,
  });
  const imp = query.data;
  const wasActive = useRef(isActive(initial));
  useEffect(() => {
    // Once screening ends, refresh the page so counts elsewhere on it follow.
    if (wasActive.current && !isActive(imp)) router.refresh();
    wasActive.current = isActive(imp);
  }, [imp, router]);
  const status = STATUS[imp.status];
  const gone = query.error instanceof GoneError;
  return (
    <li className="py-4" data-testid={`import-${imp.id}`}>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <p className="font-medium text-ink">
            <span className="break-all">{imp.fileName}</span>{' '}
            <span className="text-sm font-normal text-ink-faint">#{imp.id}</span>
          </p>
          <p className="text-xs text-ink-soft">
            Uploaded <span className="whitespace-nowrap">{formatDateTime(imp.createdAt)}</span>
            {imp.createdBy ? ` by ${imp.createdBy}` : ''} · {formatNumber(imp.rows)}
            {imp.kind === 'tracks' ? ' flown' : ''} flight{imp.rows === 1 ? '' : 's'}
          </p>
        </div>
        <span
          className={`rounded-full border px-2.5 py-0.5 text-xs font-medium ${status.className}`}
          data-testid="import-status"
        >
          {gone ? 'Deleted' : status.label}
        </span>
      </div>
      <div className="mt-3 space-y-2">
        <Summary imp={imp} />
        <EngineVersions
          imp={imp}
          current={currentEngineVersion}
          canRescreen={canRescreen}
          onRescreen={async (id) => {
            const state = await onRescreen(id);
            if (state?.ok) await query.refetch();
            return state;
          }}
        />
        {query.error && !gone ? <p className="text-xs text-caution">{query.error.message}</p> : null}
        {imp.problemCount ? (
          <details className="text-sm">
            <summary className="cursor-pointer text-ink-soft hover:text-ink">
              {imp.problemCount} note{imp.problemCount === 1 ? '' : 's'} on this import
            </summary>
            <div className="mt-2">
              <ProblemsTable
                problems={imp.problems}
                total={imp.problemCount}
                caption={`Notes on import ${imp.id}`}
                heading="Note"
              />
            </div>
          </details>
        ) : null}
      </div>
      {!gone ? (
        <div className="mt-3 flex flex-wrap items-center gap-2">
          <Link href={`/w/${slug}/flights?import=${imp.id}`} className={buttonClass('secondary')}>
            Show its flights
          </Link>
          {canDelete ? <DeleteImport imp={imp} onDelete={onDelete} /> : null}
        </div>
      ) : null}
    </li>
  );
}

/** The workspace's imports, newest first; those still screening poll their progress every second. */
export function ImportList({
  slug,
  imports,
  canDelete,
  onDelete,
  canRescreen,
  onRescreen,
  currentEngineVersion,
}: {
  slug: string;
  imports: ImportDto[];
  canDelete: boolean;
  onDelete: (id: number) => Promise<ActionState>;
  canRescreen: boolean;
  onRescreen: (id: number) => Promise<ActionState>;
  currentEngineVersion: string;
}) {
  const [notice, setNotice] = useState<string>();
  const remove = async (id: number): Promise<ActionState> => {
    const state = await onDelete(id);
    if (state?.ok) setNotice(state.message);
    return state;
  };
  return (
    <div>
      {notice ? (
        <Notice tone="success" role="status">
          {notice}
        </Notice>
      ) : null}
      <ul className="divide-y divide-line" aria-label="Imports">
        {imports.map((imp) => (
          <ImportItem
            key={imp.id}
            slug={slug}
            initial={imp}
            canDelete={canDelete}
            onDelete={remove}
            canRescreen={canRescreen}
            onRescreen={onRescreen}
            currentEngineVersion={currentEngineVersion}
          />
        ))}
      </ul>
    </div>
  );
}
