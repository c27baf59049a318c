import { KG_PER_LB, KG_PER_TONNE, KM_PER_NM, M_PER_FT, type UnitSystem } from '@/lib/units';

/**
 * Display formatting with the user's unit preference. Stored and computed values are always SI
 * (km, m, kg); only display converts.
 */
export { KG_PER_LB, KM_PER_NM, M_PER_FT };

/** Month names, January first. */
export const MONTH_NAMES = [
  'January',
  'February',
  'March',
  'April',
  'May',
  'June',
  'July',
  'August',
  'September',
  'October',
  'November',
  'December',
] as const;

const nf = (digits: number) =>
  new Intl.NumberFormat('en-GB', { maximumFractionDigits: digits, minimumFractionDigits: digits });

export function formatNumber(v: number, digits = 0): string {
  return Number.isFinite(v) ? nf(digits).format(v) : '–';
}

export function formatDistance(km: number, units: UnitSystem, digits = 0): string {
  return units === 'imperial' ? `${formatNumber(km / KM_PER_NM, digits)} NM` : `${formatNumber(km, digits)} km`;
}

export function formatAltitude(m: number, units: UnitSystem): string {
  return units === 'imperial' ? `${formatNumber(m / M_PER_FT, 0)} ft` : `${formatNumber(m, 0)} m`;
}

/**
 * Masses: kg below 10 t, tonnes above; pounds in the imperial preference. Small masses get two
 * decimals; an exact zero (an empty month) gets none, as "0.00 kg" would claim a precision nobody measured.
 */
export function formatMass(kg: number, units: UnitSystem, digits?: number): string {
  const small = (v: number) => (v !== 0 && Math.abs(v) < 10 ? 2 : 0);
  if (units === 'imperial') {
    const lb = kg / KG_PER_LB;
    return `${formatNumber(lb, digits ?? small(lb))} lb`;
  }
  if (Math.abs(kg) >= 10_000) return `${formatNumber(kg / KG_PER_TONNE, digits ?? 1)} t`;
  return `${formatNumber(kg, digits ?? small(kg))} kg`;
}

/**
 * A low-high band in one unit, the one the larger end would be shown in ("5.2 – 399.0 t", not
 * "5,169 kg – 399.0 t"), so the two ends read against each other.
 */
export function formatMassRange(lowKg: number, highKg: number, units: UnitSystem, separator = ' – '): string {
  if (units === 'imperial') {
    const lo = lowKg / KG_PER_LB;
    const hi = highKg / KG_PER_LB;
    const d = Math.max(Math.abs(lo), Math.abs(hi)) < 10 ? 2 : 0;
    return `${formatNumber(lo, d)}${separator}${formatNumber(hi, d)} lb`;
  }
  const top = Math.max(Math.abs(lowKg), Math.abs(highKg));
  if (top >= 10_000)
    return `${formatNumber(lowKg / KG_PER_TONNE, 1)}${separator}${formatNumber(highKg / KG_PER_TONNE, 1)} t`;
  const d = top < 10 ? 2 : 0;
  return `${formatNumber(lowKg, d)}${separator}${formatNumber(highKg, d)} kg`;
}

/** The one mass unit a table column (or row) shows all its cells in. */
export type MassUnit = 'kg' | 't' | 'lb';

/**
 * The unit that suits a column's largest value, so every cell of it reads in one unit ("17.4 t" above
 * "9.7 t", never "9,733 kg"): tonnes once the largest reaches 10 t (where {@link formatMass} switches),
 * kg below; pounds in the imperial preference. Non-finite values are ignored.
 */
export function massColumnUnit(valuesKg: readonly (number | null | undefined)[], units: UnitSystem): MassUnit {
  if (units === 'imperial') return 'lb';
  const top = Math.max(0, ...valuesKg.filter((v): v is number => Number.isFinite(v)).map((v) => Math.abs(v)));
  return top >= 10_000 ? 't' : 'kg';
}

/**
 * A mass in the unit chosen for its column. Tonnes to one decimal (a non-zero mass under 0.05 t reads
 * "< 0.1 t", not a misleading "0.0 t"); kg and lb as {@link formatMass} shows them.
 */
export function formatMassIn(kg: number, unit: MassUnit): string {
  if (!Number.isFinite(kg)) return '–';
  if (unit === 'lb') return formatMass(kg, 'imperial');
  if (unit === 'kg') {
    const small = kg !== 0 && Math.abs(kg) < 10 ? 2 : 0;
    return `${formatNumber(kg, small)} kg`;
  }
  const t = kg / KG_PER_TONNE;
  if (kg !== 0 && Math.abs(t) < 0.05) return `${t < 0 ? '> −0.1' : '< 0.1'} t`;
  return `${formatNumber(t, kg === 0 ? 0 : 1)} t`;
}

export function formatPercent(fraction: number, digits = 0): string {
  return Number.isFinite(fraction) ? `${formatNumber(fraction * 100, digits)} %` : '–';
}

export function formatMoney(cents: number, currency = 'USD'): string {
  return new Intl.NumberFormat('en-US', { style: 'currency', currency }).format(cents / 100);
}

export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '–';
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toISOString().slice(0, 10);
}

export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '–';
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

const SHORT_MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** `2026-06` -> `Jun 2026` (a short "26-06" reads as a day of June). Anything else comes back as given. */
export function formatMonth(yearMonth: string): string {
  const m = /^(\d{4})-(\d{2})$/.exec(yearMonth);
  const month = m ? Number(m[2]) : 0;
  return m && month >= 1 && month <= 12 ? `${SHORT_MONTHS[month - 1]} ${m[1]}` : yearMonth;
}
