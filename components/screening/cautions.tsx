import { Notice } from '@/components/ui/notice';

/** The result's own cautions (the standing ones and those raised by this input), shown before the figures are used. */
export function ScreeningCautions({ cautions }: { cautions: readonly string[] }) {
  return (
    <Notice tone="caution" title="Read before using these figures">
      <ul className="list-disc space-y-1 pl-5" data-testid="cautions">
        {cautions.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </Notice>
  );
}
