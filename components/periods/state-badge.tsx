import { PERIOD_STATE_LABELS, type PeriodState } from '@/lib/periods/calendar';

const TONES: Record<PeriodState, string> = {
  open: 'border-line-strong bg-paper-sunk text-ink-soft',
  review: 'border-caution/40 bg-caution-soft text-ink',
  signed: 'border-tropo/40 bg-tropo-soft text-ink',
};

export function StateBadge({ state }: { state: PeriodState }) {
  return (
    <span
      className={`inline-block rounded-full border px-2 py-0.5 text-xs font-medium ${TONES[state]}`}
      data-testid="period-state"
    >
      {PERIOD_STATE_LABELS[state]}
    </span>
  );
}
