import type { Driver, UncertaintyDrivers } from '@/lib/screening';
import { formatPercent } from '@/lib/format';

const FIGURES: { key: 'noxAboveTropopauseKg' | 'fractionAboveTropopause' | 'ozoneLossKg'; title: string }[] = [
  { key: 'noxAboveTropopauseKg', title: 'NOx above the tropopause' },
  { key: 'fractionAboveTropopause', title: 'Share above' },
  { key: 'ozoneLossKg', title: 'Ozone-loss figure' },
];

function Bars({ title, drivers }: { title: string; drivers: Driver[] }) {
  const shown = drivers.filter((d) => d.share > 0);
  return (
    <figure className="min-w-0">
      <figcaption className="mb-2 text-sm font-medium text-ink">{title}</figcaption>
      {shown.length === 0 ? (
        <p className="text-xs text-ink-soft">No spread: none of the sampled inputs moves this figure.</p>
      ) : (
        <ol
          className="space-y-1.5"
          aria-label={`Share of the spread of ${inSentence(title)} each input explains, largest first`}
        >
          {shown.map((d) => (
            <li key={d.input} className="grid grid-cols-[9.5rem_1fr_3rem] items-center gap-2 text-xs">
              <span className="truncate text-ink-soft" title={d.label}>
                {d.label}
              </span>
              <span className="h-2.5 rounded-sm bg-line/60" aria-hidden="true">
                <span
                  className="block h-2.5 rounded-sm bg-strato"
                  style={{ width: `${Math.max(1, d.share * 100)}%` }}
                />
              </span>
              <span className="figure text-right text-ink">{formatPercent(d.share)}</span>
            </li>
          ))}
        </ol>
      )}
    </figure>
  );
}

/** A label inside a sentence: its first letter lowered unless it starts an abbreviation (EI NOx, NOx/NOy). */
function inSentence(label: string): string {
  return /^[A-Z][a-z]/.test(label) ? label.charAt(0).toLowerCase() + label.slice(1) : label;
}

/** Ranked bars: how much of each headline figure's spread each sampled input explains. */
export function UncertaintyDriversChart({
  drivers,
  compact = false,
}: {
  drivers: UncertaintyDrivers;
  compact?: boolean;
}) {
  const lead = drivers.noxAboveTropopauseKg[0];
  return (
    <div data-testid="drivers-chart" className="space-y-3">
      {lead && lead.share > 0 ? (
        <p className="text-sm text-ink">
          The {inSentence(lead.label)} explains {formatPercent(lead.share)} of the spread of NOx above the tropopause.
        </p>
      ) : null}
      <div className={compact ? 'grid gap-4' : 'grid gap-6 lg:grid-cols-3'}>
        {(compact ? FIGURES.filter((f) => f.key !== 'fractionAboveTropopause') : FIGURES).map((f) => (
          <Bars key={f.key} title={f.title} drivers={drivers[f.key]} />
        ))}
      </div>
      <p className="text-xs text-ink-soft">{drivers.method}</p>
    </div>
  );
}
