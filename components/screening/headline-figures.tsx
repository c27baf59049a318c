import type { ScreeningResult, ScreeningUncertainty } from '@/lib/screening';
import type { UnitSystem } from '@/lib/units';
import { Stat } from '@/components/ui/card';
import { formatAltitude, formatDistance, formatMass, formatMassRange, formatNumber, formatPercent } from '@/lib/format';

export const EI_METHOD_LABELS: Record<ScreeningResult['eiMethod'], string> = {
  direct: 'EI NOx given directly',
  bffm2: 'Boeing Fuel Flow Method 2',
  dlr: 'DLR fuel-flow method',
};

export type HeadlineResult = Pick<
  ScreeningResult,
  | 'distanceKm'
  | 'fuelKg'
  | 'noxTotalKg'
  | 'noxAboveTropopauseKg'
  | 'noxAboveTropopauseKgN'
  | 'fractionAboveTropopause'
  | 'meanDepthAboveTropopauseKm'
  | 'eiMethod'
  | 'meanCruiseEiNoxGPerKg'
  | 'eiComparison'
> & { ozoneLoss: Pick<ScreeningResult['ozoneLoss'], 'centralKg' | 'lowKg' | 'highKg'> };

/** Percentiles shown as the headline band when the screening was sampled. */
export type HeadlineBands = Pick<
  ScreeningUncertainty,
  'noxAboveTropopauseKg' | 'fractionAboveTropopause' | 'ozoneLossKg' | 'samples'
>;

/** The headline figures of one screening, in the user's units; with `bands` the 5-95 % band leads and the all-corners band is the screening range. */
export function HeadlineFigures({
  result,
  units,
  compact = false,
  bands,
}: {
  result: HeadlineResult;
  units: UnitSystem;
  compact?: boolean;
  bands?: HeadlineBands | null;
}) {
  const r = result;
  const b = bands ?? null;
  const band = (lo: number, hi: number) => (
    <span data-testid="band-5-95">5–95 %: {formatMassRange(lo, hi, units)}</span>
  );
  const grid = compact ? 'grid gap-3 sm:grid-cols-2 xl:grid-cols-3' : 'grid gap-3 sm:grid-cols-2 lg:grid-cols-4';
  return (
    <div className={grid} data-testid="headline-figures">
      <Stat label="Distance" value={formatDistance(r.distanceKm, units)} sub="great circle along the waypoints" />
      <Stat label="Cruise fuel" value={formatMass(r.fuelKg, units)} />
      <Stat label="NOx emitted" value={formatMass(r.noxTotalKg, units)} sub="as NO2" />
      <Stat
        label="NOx above tropopause"
        value={<span data-testid="nox-above">{formatMass(r.noxAboveTropopauseKg, units)}</span>}
        sub={
          b ? (
            <>{band(b.noxAboveTropopauseKg.p5, b.noxAboveTropopauseKg.p95)} · as NO2</>
          ) : (
            `as NO2 · ${formatMass(r.noxAboveTropopauseKgN, units)} as N`
          )
        }
        tone="strato"
      />
      <Stat
        label="Share above"
        value={<span data-testid="share-above">{formatPercent(r.fractionAboveTropopause, 1)}</span>}
        sub={
          b
            ? `5–95 %: ${formatPercent(b.fractionAboveTropopause.p5, 1)} – ${formatPercent(b.fractionAboveTropopause.p95, 1)}`
            : "of the flight's NOx mass"
        }
        tone="strato"
      />
      <Stat
        label="Mean depth above"
        value={r.noxAboveTropopauseKg > 0 ? formatAltitude(r.meanDepthAboveTropopauseKm * 1000, units) : '–'}
        sub="NOx-weighted, over the part above"
        tone="strato"
      />
      <Stat
        label="Ozone-loss figure"
        value={<span data-testid="ozone-central">{formatMass(r.ozoneLoss.centralKg, units)}</span>}
        sub={
          b ? (
            <>
              {band(b.ozoneLossKg.p5, b.ozoneLossKg.p95)}; screening range{' '}
              {formatMassRange(r.ozoneLoss.lowKg, r.ozoneLoss.highKg, units)} (every input low, then high, together);
              gross catalytic loss
            </>
          ) : (
            `O3, screening range ${formatMassRange(r.ozoneLoss.lowKg, r.ozoneLoss.highKg, units)} (every input low, then high, together: not a confidence interval); gross catalytic loss`
          )
        }
        tone="strato"
      />
      <Stat
        label="EI NOx"
        value={`${formatNumber(r.meanCruiseEiNoxGPerKg, 1)} g/kg`}
        sub={
          r.eiComparison
            ? `${EI_METHOD_LABELS[r.eiMethod]}; BFFM2 ${formatNumber(r.eiComparison.bffm2, 1)} vs DLR ${formatNumber(r.eiComparison.dlr, 1)} g/kg`
            : EI_METHOD_LABELS[r.eiMethod]
        }
      />
    </div>
  );
}
