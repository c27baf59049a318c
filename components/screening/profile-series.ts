import type { ScreeningSegment } from '@/lib/screening';
import type { UnitSystem } from '@/lib/units';
import { KM_PER_NM, M_PER_FT, formatAltitude, formatDistance, formatMass, formatNumber } from '@/lib/format';

/** The vertical profile as the chart draws it: two aligned lines, stepped per segment, in display units. */
export interface ProfileSeries {
  distanceLabel: string;
  altitudeLabel: string;
  /** Distance of each point from departure. */
  x: number[];
  /** Cruise pressure altitude at each point. */
  cruise: number[];
  /** Tropopause (as pressure altitude) at each point. */
  tropopause: number[];
  /** Whether the segment starting at each point is above the tropopause. */
  above: boolean[];
  /** Index of the segment each point belongs to. */
  segment: number[];
  /** Tooltip lines per segment, already in the user's units. */
  tooltips: string[][];
  /** Tooltip title per segment. */
  titles: string[];
  maxAltitude: number;
}

type ProfileSegment = Pick<
  ScreeningSegment,
  | 'startKm'
  | 'endKm'
  | 'flightLevel'
  | 'altitudeM'
  | 'tropopauseM'
  | 'aboveTropopause'
  | 'fuelKg'
  | 'noxKg'
  | 'depthAboveTropopauseKm'
  | 'lat'
  | 'lon'
>;

/**
 * Each segment contributes its start and end point at its own level and tropopause, so a step
 * climb shows as a vertical rise and the shading follows exactly what the engine compared.
 */
export function profileSeries(segments: readonly ProfileSegment[], units: UnitSystem): ProfileSeries {
  const dist = (km: number) => (units === 'imperial' ? km / KM_PER_NM : km);
  const alt = (m: number) => (units === 'imperial' ? m / M_PER_FT : m);
  const out: ProfileSeries = {
    distanceLabel: units === 'imperial' ? 'Distance from departure (NM)' : 'Distance from departure (km)',
    altitudeLabel: units === 'imperial' ? 'Pressure altitude (ft)' : 'Pressure altitude (m)',
    x: [],
    cruise: [],
    tropopause: [],
    above: [],
    segment: [],
    tooltips: [],
    titles: [],
    maxAltitude: 0,
  };
  segments.forEach((s, i) => {
    for (const km of [s.startKm, s.endKm]) {
      out.x.push(dist(km));
      out.cruise.push(alt(s.altitudeM));
      out.tropopause.push(alt(s.tropopauseM));
      out.above.push(s.aboveTropopause);
      out.segment.push(i);
    }
    out.maxAltitude = Math.max(out.maxAltitude, alt(s.altitudeM), alt(s.tropopauseM));
    out.titles.push(`${formatDistance(s.startKm, units)} – ${formatDistance(s.endKm, units)} from departure`);
    out.tooltips.push([
      `FL${s.flightLevel} (${formatAltitude(s.altitudeM, units)})`,
      `Tropopause ${formatAltitude(s.tropopauseM, units)}`,
      s.aboveTropopause
        ? `Above the tropopause by ${formatAltitude(s.depthAboveTropopauseKm * 1000, units)}`
        : 'Below the tropopause',
      `Fuel ${formatMass(s.fuelKg, units)}, NOx ${formatMass(s.noxKg, units)}`,
      `At ${formatNumber(s.lat, 1)}°, ${formatNumber(s.lon, 1)}°`,
    ]);
  });
  return out;
}

/**
 * At most `max` segments for a chart: consecutive segments are merged (the span of the group at the
 * level, tropopause and figures of its middle segment; fuel and NOx summed), so a 20 000-point track
 * draws without sending every segment to the browser.
 */
export function thinSegments<T extends ProfileSegment>(segments: readonly T[], max = 1500): ProfileSegment[] {
  if (segments.length <= max) return segments.slice();
  const k = Math.ceil(segments.length / max);
  const out: ProfileSegment[] = [];
  for (let i = 0; i < segments.length; i += k) {
    const group = segments.slice(i, i + k);
    const mid = group[Math.floor(group.length / 2)];
    out.push({
      ...mid,
      startKm: group[0].startKm,
      endKm: group[group.length - 1].endKm,
      fuelKg: group.reduce((t, s) => t + s.fuelKg, 0),
      noxKg: group.reduce((t, s) => t + s.noxKg, 0),
    });
  }
  return out;
}
