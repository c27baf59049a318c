'use client';

/** The error panel of a library page segment. */
export function LibraryError({ what, reset }: { what: string; reset: () => void }) {
  return (
    <div role="alert" className="rounded-card border border-danger/40 bg-danger-soft p-6">
      <h1 className="text-lg font-semibold text-ink">{what} could not be shown</h1>
      <p className="mt-1 text-sm text-ink-soft">
        Nothing you saved was lost. Try again; if it keeps happening, note the time and tell your administrator.
      </p>
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
