/** Placeholders shown while a screening page loads. */
export function PageSkeleton({ title, blocks = 3 }: { title: string; blocks?: number }) {
  return (
    <div aria-busy="true" aria-live="polite">
      <p className="sr-only">Loading {title}…</p>
      <div className="mb-6 space-y-2">
        <div className="h-7 w-72 animate-pulse rounded bg-paper-sunk" />
        <div className="h-4 w-[28rem] max-w-full animate-pulse rounded bg-paper-sunk" />
      </div>
      <div className="mb-6 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {Array.from({ length: 4 }, (_, i) => (
          <div key={i} className="h-20 animate-pulse rounded-card border border-line bg-paper-raised" />
        ))}
      </div>
      <div className="space-y-6">
        {Array.from({ length: blocks }, (_, i) => (
          <div key={i} className="h-64 animate-pulse rounded-card border border-line bg-paper-raised" />
        ))}
      </div>
    </div>
  );
}

/** The form's two columns while the workspace's aircraft, routes and soundings are read. */
export function FormSkeleton() {
  return (
    <div aria-busy="true" className="grid gap-6 xl:grid-cols-2">
      <p className="sr-only">Loading the form…</p>
      <div className="space-y-5">
        {Array.from({ length: 4 }, (_, i) => (
          <div key={i} className="h-40 animate-pulse rounded-card border border-line bg-paper-raised" />
        ))}
      </div>
      <div className="h-96 animate-pulse rounded-card border border-line bg-paper-raised" />
    </div>
  );
}

/** One card's placeholder inside a page. */
export function CardSkeleton({ label, height = 'h-64' }: { label: string; height?: string }) {
  return (
    <div aria-busy="true" className={`${height} animate-pulse rounded-card border border-line bg-paper-raised`}>
      <p className="sr-only">Loading {label}…</p>
    </div>
  );
}
