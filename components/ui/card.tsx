import type { ReactNode } from 'react';

export function Card({
  title,
  actions,
  children,
  className = '',
}: {
  title?: ReactNode;
  actions?: ReactNode;
  children: ReactNode;
  className?: string;
}) {
  return (
    <section className={`rounded-card border border-line bg-paper-raised p-5 shadow-sm ${className}`}>
      {title || actions ? (
        <header className="mb-4 flex items-center justify-between gap-3">
          {title ? <h2 className="text-base font-semibold text-ink">{title}</h2> : <span />}
          {actions}
        </header>
      ) : null}
      {children}
    </section>
  );
}

export function PageHeader({ title, lead, actions }: { title: ReactNode; lead?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-ink">{title}</h1>
        {lead ? <p className="mt-1 max-w-3xl text-sm text-ink-soft">{lead}</p> : null}
      </div>
      {actions ? <div className="flex gap-2">{actions}</div> : null}
    </div>
  );
}

export function Stat({
  label,
  value,
  sub,
  tone = 'plain',
}: {
  label: string;
  value: ReactNode;
  sub?: ReactNode;
  tone?: 'plain' | 'strato' | 'tropo';
}) {
  const toneClass =
    tone === 'strato'
      ? 'border-strato/40 bg-strato-soft'
      : tone === 'tropo'
        ? 'border-tropo/40 bg-tropo-soft'
        : 'border-line bg-paper-raised';
  return (
    <div className={`rounded-card border p-4 ${toneClass}`}>
      <div className="text-xs font-medium uppercase tracking-wide text-ink-soft">{label}</div>
      <div className="figure mt-1 text-xl font-semibold text-ink">{value}</div>
      {sub ? <div className="figure mt-0.5 text-xs text-ink-soft">{sub}</div> : null}
    </div>
  );
}

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-card border border-dashed border-line-strong bg-paper-raised p-8 text-center">
      <p className="font-medium text-ink">{title}</p>
      {children ? <div className="mx-auto mt-1 max-w-xl text-sm text-ink-soft">{children}</div> : null}
      {action ? <div className="mt-4 flex justify-center">{action}</div> : null}
    </div>
  );
}
