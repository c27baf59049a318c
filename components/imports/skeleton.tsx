/** Placeholder while the imports or flights page loads. */
export function ImportsSkeleton({ label, blocks = 2 }: { label: string; blocks?: number }) {
  return (
    <div aria-busy="true" aria-live="polite">
      <p className="sr-only">{label}</p>
      <div className="mb-6 space-y-2">
        <div className="h-7 w-56 animate-pulse rounded bg-paper-sunk" />
        <div className="h-4 w-[32rem] max-w-full animate-pulse rounded bg-paper-sunk" />
      </div>
      <div className="space-y-6">
        {Array.from({ length: blocks }, (_, i) => (
          <div key={i} className="h-56 animate-pulse rounded-card border border-line bg-paper-raised" />
        ))}
      </div>
    </div>
  );
}
