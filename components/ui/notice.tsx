import type { ReactNode } from 'react';

type Tone = 'info' | 'caution' | 'danger' | 'success';
const tones: Record<Tone, string> = {
  info: 'border-accent/30 bg-accent-soft text-ink',
  caution: 'border-caution/40 bg-caution-soft text-ink',
  danger: 'border-danger/40 bg-danger-soft text-ink',
  success: 'border-tropo/40 bg-tropo-soft text-ink',
};

export function Notice({
  tone = 'info',
  title,
  children,
  role,
}: {
  tone?: Tone;
  title?: ReactNode;
  children?: ReactNode;
  role?: 'status' | 'alert';
}) {
  return (
    <div role={role} className={`rounded-md border px-4 py-3 text-sm ${tones[tone]}`}>
      {title ? <p className="font-semibold">{title}</p> : null}
      {children ? <div className={title ? 'mt-1' : ''}>{children}</div> : null}
    </div>
  );
}

/** The standing caution beside every figure that could steer a decision. */
export function ScreeningCaution() {
  return (
    <Notice tone="caution" title="Screening estimate">
      For planning and reporting support, not a certified emissions inventory or a regulatory method. The ozone figure
      is a gross catalytic loss, not a net column change. Follow the operator&apos;s approved methods and applicable
      regulation.
    </Notice>
  );
}
