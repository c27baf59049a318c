import { formatNumber } from '@/lib/format';
import { Tag } from './badges';
import { TYPICAL_CRUISE_EI_G_PER_KG, type CruiseEiCheck } from '@/lib/library/cruise-ei-check';

/** The cruise EI check value, tagged against the typical 10-20 g/kg band. */
export function CruiseCheckTag({ check }: { check: CruiseEiCheck }) {
  const { low, high } = TYPICAL_CRUISE_EI_G_PER_KG;
  const note =
    check.band === 'typical'
      ? `within the ${low}–${high} g/kg typical of modern subsonic turbofans at cruise`
      : check.band === 'low'
        ? `below the ${low}–${high} g/kg typical at cruise: check the EI values and their order`
        : `above the ${low}–${high} g/kg typical at cruise: check the EI values and the fuel flows`;
  return (
    <span className="inline-flex flex-wrap items-center gap-1.5">
      <span className="figure font-semibold text-ink">{formatNumber(check.eiNoxGPerKg, 1)} g/kg</span>
      <Tag tone={check.band === 'typical' ? 'tropo' : 'caution'} title={note}>
        {check.band === 'typical' ? 'typical' : check.band === 'low' ? 'low' : 'high'}
      </Tag>
      {check.extrapolated ? (
        <Tag
          tone="caution"
          title="The cruise point lies outside the four certification points; the curve was extended."
        >
          extrapolated
        </Tag>
      ) : null}
      <span className="sr-only">{note}</span>
    </span>
  );
}
