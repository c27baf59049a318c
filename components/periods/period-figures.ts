import type { UnitSystem } from '@/db/users';
import { formatMass, formatMassIn, formatNumber, type MassUnit } from '@/lib/format';
import type { PeriodFigures, TargetStatus } from '@/lib/periods/service';

/** How each target status reads on the period page: in the targets table and in the trend. */
export const TARGET_STATUS: Record<TargetStatus, { label: string; className: string }> = {
  'on-track': { label: 'Under 90 % of target', className: 'text-tropo-strong' },
  near: { label: '90 % of target reached', className: 'text-caution font-medium' },
  over: { label: 'Target passed', className: 'text-danger font-medium' },
  'no-data': { label: 'No figure', className: 'text-ink-faint' },
};

/** A target measure's value with its unit (tonnes to 2 places, percentages to 1, the rest to 3). */
export const metricText = (v: number | null, unit: string) =>
  v === null ? '–' : `${formatNumber(v, unit === 't' ? 2 : unit === '%' ? 1 : 3)} ${unit}`;

/** NOx above the tropopause per 1000 km flown, in the user's units (or in the unit chosen for its column). */
export const per1000 = (f: PeriodFigures, u: UnitSystem, column?: MassUnit) =>
  f.noxAbovePer1000KmKg === null
    ? '–'
    : `${column ? formatMassIn(f.noxAbovePer1000KmKg, column) : formatMass(f.noxAbovePer1000KmKg, u)} per 1000 km`;
