'use client';

const SAVED_NOTHING_LOST =
  'Nothing you saved was lost. Try again; if it keeps happening, note the time and tell your administrator.';

type ErrorBoundaryProps = { error: Error & { digest?: string }; reset: () => void };

/** The error panel of a page segment: what could not be shown, what it means, and a way to try again. */
export function SectionError({
  what,
  detail = SAVED_NOTHING_LOST,
  reset,
}: {
  what: string;
  detail?: string;
  reset: () => void;
}) {
  return (
    <div role="alert" className="rounded-card border border-danger/40 bg-danger-soft p-6">
      <h1 className="text-lg font-semibold text-ink">{what} could not be shown</h1>
      <p className="mt-1 text-sm text-ink-soft">{detail}</p>
      <button
        type="button"
        onClick={reset}
        className="mt-4 rounded-md bg-accent px-3.5 py-2 text-sm font-medium text-white hover:bg-accent-strong"
      >
        Try again
      </button>
    </div>
  );
}

/** The default export of a segment's `error.tsx`: `export default sectionError('Saved routes')`. */
export function sectionError(what: string, detail?: string) {
  function SegmentErrorBoundary({ reset }: ErrorBoundaryProps) {
    return <SectionError what={what} detail={detail} reset={reset} />;
  }
  return SegmentErrorBoundary;
}
