/** Placeholder while a library page loads: a header, a table and a side card. */
export function LibrarySkeleton({ what }: { what: string }) {
  return (
    <div aria-busy="true" aria-live="polite">
      <p className="sr-only">Loading {what}…</p>
      <div className="mb-6 space-y-2">
        <div className="h-7 w-64 animate-pulse rounded bg-paper-sunk" />
        <div className="h-4 w-[30rem] max-w-full animate-pulse rounded bg-paper-sunk" />
      </div>
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <div className="h-80 animate-pulse rounded-card border border-line bg-paper-raised" />
        <div className="h-80 animate-pulse rounded-card border border-line bg-paper-raised" />
      </div>
    </div>
  );
}
