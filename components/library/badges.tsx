import type { ReactNode } from 'react';

/** Marks invented demo values so nobody mistakes them for certification data. */
export function DemoBadge() {
  return (
    <span
      className="ml-2 inline-flex items-center whitespace-nowrap rounded-full border border-caution/40 bg-caution-soft px-2 py-0.5 text-[11px] font-semibold uppercase tracking-wide text-caution"
      title="Invented values for the demo, not a real engine"
    >
      demo data
    </span>
  );
}

export function Tag({
  tone = 'plain',
  children,
  title,
}: {
  tone?: 'plain' | 'caution' | 'strato' | 'tropo';
  children: ReactNode;
  title?: string;
}) {
  const tones = {
    plain: 'border-line-strong bg-paper-sunk text-ink-soft',
    caution: 'border-caution/40 bg-caution-soft text-caution',
    strato: 'border-strato/40 bg-strato-soft text-strato-strong',
    tropo: 'border-tropo/40 bg-tropo-soft text-tropo-strong',
  } as const;
  return (
    <span
      title={title}
      className={`inline-flex items-center rounded-full border px-2 py-0.5 text-xs font-medium ${tones[tone]}`}
    >
      {children}
    </span>
  );
}
