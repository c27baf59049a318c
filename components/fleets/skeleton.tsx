/** Placeholder blocks while a fleet or report page loads. */
export function PageSkeleton({ label, blocks = 3 }: { label: string; blocks?: number }) {
  return (
    <div aria-busy="true" aria-label={label} className="space-y-6">
      <div className="h-8 w-64 animate-pulse rounded bg-paper-sunk" />
      <div className="h-4 w-[32rem] max-w-full animate-pulse rounded bg-paper-sunk" />
      {Array.from({ length: blocks }, (_, i) => (
        <div key={i} className="h-40 animate-pulse rounded-card border border-line bg-paper-raised" />
      ))}
      <p className="sr-only" role="status">
        {label}
      </p>
    </div>
  );
}
