import type { ScreeningResult } from '@/lib/screening';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { TableHead } from '@/components/ui/table-head';

const SUPERSCRIPT: Record<string, string> = {
  '-': '⁻',
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
};

/** 0.00045 -> "4.5 × 10⁻⁴"; plain decimals between 0.01 and 10 000. */
export function sci(n: number): string {
  if (n === 0) return '0';
  const abs = Math.abs(n);
  if (abs >= 0.01 && abs < 10_000) return String(Number(n.toPrecision(3)));
  const [mantissa, exponent] = n.toExponential(2).split('e');
  const exp = String(Number(exponent)).replace(/./g, (c) => SUPERSCRIPT[c] ?? c);
  return `${Number(mantissa)} × 10${exp}`;
}

/** How the figures were made: the method notes of the result and the ozone-figure inputs with their sources. */
export function AssumptionsList({
  result,
}: {
  result: Pick<ScreeningResult, 'assumptions' | 'ozoneLoss' | 'engineVersion'>;
}) {
  const a = result.ozoneLoss.assumptions;
  const bands: [string, { low: number; central: number; high: number; source: string }][] = [
    ['J(O3 → O(3P)), overhead sun, s⁻¹', a.jO3NoonPerS],
    ['J(NO2), overhead sun, s⁻¹', a.jNo2NoonPerS],
    ['Daylight factor D (sunlit fraction)', a.daylightFactor],
    ['NOx share of NOy', a.noxToNoyFraction],
  ];
  return (
    <div className="space-y-5 text-sm">
      <ul className="list-disc space-y-1.5 pl-5 text-ink-soft">
        {result.assumptions.map((line) => (
          <li key={line}>{line}</li>
        ))}
      </ul>
      <ScrollRegion label="Ozone-figure inputs">
        <table className="w-full min-w-[600px]">
          <caption className="mb-2 text-left font-medium text-ink">Ozone-figure inputs (low – central – high)</caption>
          <TableHead
            pad="py-1.5"
            columns={[
              'Input',
              { label: 'Low', right: true },
              { label: 'Central', right: true },
              { label: 'High', right: true },
              'Source',
            ]}
          />
          <tbody className="figure">
            {bands.map(([label, b]) => (
              <tr key={label} className="border-t border-line align-top">
                <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                  {label}
                </th>
                <td className="py-1.5 pr-3 text-right">{sci(b.low)}</td>
                <td className="py-1.5 pr-3 text-right">{sci(b.central)}</td>
                <td className="py-1.5 pr-3 text-right">{sci(b.high)}</td>
                <td className="py-1.5 text-xs text-ink-soft">{b.source}</td>
              </tr>
            ))}
            {a.sunlight ? (
              <tr className="border-t border-line align-top">
                <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                  Sunlight (NOx-weighted)
                </th>
                <td colSpan={3} className="py-1.5 pr-3 text-right">
                  day fraction {sci(a.sunlight.dayFraction)}, daily-mean cos zenith {sci(a.sunlight.meanCosZenith)},
                  daytime cos zenith {sci(a.sunlight.daytimeCosZenith)}, e-folding residence{' '}
                  {sci(a.sunlight.residenceWindowYears)} yr
                  {a.sunlight.activeShare !== undefined ? `, NOx active share ${sci(a.sunlight.activeShare)}` : ''}
                </td>
                <td className="py-1.5 text-xs text-ink-soft">{a.sunlight.source}</td>
              </tr>
            ) : null}
            <tr className="border-t border-line align-top">
              <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                Residence time above the tropopause
              </th>
              <td colSpan={3} className="py-1.5 pr-3 text-right">
                {a.residenceTime.tropicalYears ? 'extratropics ' : ''}
                {a.residenceTime.depthKm.map((d, i) => `${d} km: ${a.residenceTime.years[i]} yr`).join(', ')}
                {a.residenceTime.tropicalYears
                  ? `; tropics ${a.residenceTime.depthKm.map((d, i) => `${d} km: ${a.residenceTime.tropicalYears?.[i]} yr`).join(', ')}`
                  : ''}{' '}
                (× {a.residenceTime.lowFactor} low, × {a.residenceTime.highFactor} high)
              </td>
              <td className="py-1.5 text-xs text-ink-soft">{a.residenceTime.source}</td>
            </tr>
            <tr className="border-t border-line align-top">
              <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                OH, molecules cm⁻³
              </th>
              <td colSpan={3} className="py-1.5 pr-3 text-right">
                {sci(a.ohCm3.value)}
              </td>
              <td className="py-1.5 text-xs text-ink-soft">{a.ohCm3.source}</td>
            </tr>
            <tr className="border-t border-line align-top">
              <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                Ozone profile
              </th>
              <td colSpan={3} className="py-1.5 pr-3 text-right">
                {a.ozoneProfile.profilesUsed.join(', ') || '–'}
              </td>
              <td className="py-1.5 text-xs text-ink-soft">
                {a.ozoneProfile.choice}. {a.ozoneProfile.source}
              </td>
            </tr>
          </tbody>
        </table>
      </ScrollRegion>
      <p className="text-xs text-ink-soft">
        {a.band} Rate constants: {a.rateConstants}. Engine version {result.engineVersion}.
      </p>
    </div>
  );
}
