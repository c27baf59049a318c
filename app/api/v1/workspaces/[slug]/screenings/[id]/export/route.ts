import { idParam, workspaceRoute } from '@/lib/api/handler';
import { getScreening, routeLabel, type ScreeningRecord } from '@/lib/screening-service/saved';
import { invalidFields } from '@/lib/errors';
import { uncertaintyFor } from '@/lib/screening-service/uncertainty-view';
import type { Percentiles, ScreeningUncertainty } from '@/lib/screening';
import { csvRecords, type CsvCell as Cell } from '@/lib/csv/write';

const round = (n: number, digits: number): number => Number(n.toFixed(digits));

const SEGMENT_HEADER = [
  'Segment',
  'Start (km)',
  'End (km)',
  'Latitude (deg)',
  'Longitude (deg)',
  'Flight level',
  'Pressure altitude (m)',
  'Tropopause (m)',
  'Tropopause source',
  'Above tropopause',
  'Depth above tropopause (km)',
  'Fuel (kg)',
  'NOx (kg NO2)',
  'Ozone-loss figure (kg O3)',
];

/**
 * A header block of the headline figures (label, value), a separating row, then one row per
 * segment. Every record carries the same number of fields (RFC 4180 s.2.4) and ends in CRLF.
 */
function percentileRows(u: ScreeningUncertainty | null): Cell[][] {
  if (u === null) return [['Percentiles', 'Not available: saved by an earlier engine version; screen it again.']];
  const three = (label: string, p: Percentiles, digits: number): Cell[][] => [
    [`${label} 5th percentile`, round(p.p5, digits)],
    [`${label} 50th percentile`, round(p.p50, digits)],
    [`${label} 95th percentile`, round(p.p95, digits)],
  ];
  return [
    ['Percentiles from', `${u.samples} samples, seed ${u.seed}`],
    ...three('NOx above the tropopause (kg NO2)', u.noxAboveTropopauseKg, 4),
    ...three('Share of NOx above the tropopause', u.fractionAboveTropopause, 6),
    ...three('Ozone-loss figure (kg O3)', u.ozoneLossKg, 4),
    ['Ozone percentiles outside the screening range', u.outsideScreeningRange.join(' ') || 'none'],
    ...u.drivers.ozoneLossKg.map((d): Cell[] => [`Share of the ozone figure's spread: ${d.label}`, round(d.share, 4)]),
  ];
}

function toCsv(r: ScreeningRecord): string {
  const res = r.result;
  const u = uncertaintyFor(r.input, res);
  const rows: Cell[][] = [
    [
      'Tropopass screening export',
      'Screening estimate for planning and reporting support; not a certified emissions inventory or a regulatory method.',
    ],
    ['Screening', r.name],
    ['Screening id', r.id],
    ['Saved at (UTC)', r.createdAt],
    ['Route', routeLabel(r.input)],
    ['Aircraft type', r.aircraftCode],
    ['Flight date', r.input.flightDate ?? null],
    ['Month for the climatology', res.month],
    ['Engine version', res.engineVersion],
    ['Distance (km)', round(res.distanceKm, 3)],
    ['Cruise fuel (kg)', round(res.fuelKg, 3)],
    ['NOx total (kg NO2)', round(res.noxTotalKg, 4)],
    ['NOx above the tropopause (kg NO2)', round(res.noxAboveTropopauseKg, 4)],
    ['NOx above the tropopause (kg N)', round(res.noxAboveTropopauseKgN, 4)],
    ['Share of NOx above the tropopause', round(res.fractionAboveTropopause, 6)],
    ['Mean depth above the tropopause (km)', round(res.meanDepthAboveTropopauseKm, 4)],
    ['EI method', res.eiMethod],
    ['Mean cruise EI NOx (g/kg)', round(res.meanCruiseEiNoxGPerKg, 4)],
    ['EI NOx by BFFM2 (g/kg)', res.eiComparison ? round(res.eiComparison.bffm2, 4) : null],
    ['EI NOx by DLR (g/kg)', res.eiComparison ? round(res.eiComparison.dlr, 4) : null],
    ['Ozone-loss figure, central (kg O3)', round(res.ozoneLoss.centralKg, 4)],
    ['Ozone-loss figure, low (kg O3)', round(res.ozoneLoss.lowKg, 4)],
    ['Ozone-loss figure, high (kg O3)', round(res.ozoneLoss.highKg, 4)],
    ...percentileRows(u),
    ['Tropopause', res.tropopause.description],
    ...res.cautions.map((c): Cell[] => ['Caution', c]),
    [],
    SEGMENT_HEADER,
    ...res.segments.map((s, i): Cell[] => [
      i + 1,
      round(s.startKm, 3),
      round(s.endKm, 3),
      round(s.lat, 5),
      round(s.lon, 5),
      s.flightLevel,
      round(s.altitudeM, 1),
      round(s.tropopauseM, 1),
      s.tropopauseSource,
      s.aboveTropopause,
      round(s.depthAboveTropopauseKm, 4),
      round(s.fuelKg, 4),
      round(s.noxKg, 5),
      round(s.ozoneLossKg, 5),
    ]),
  ];
  return csvRecords(rows, SEGMENT_HEADER.length);
}

function fileStem(r: ScreeningRecord): string {
  const label = routeLabel(r.input)
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toLowerCase()
    .slice(0, 60);
  return label ? `screening-${r.id}-${label}` : `screening-${r.id}`;
}

/** The saved screening as a download: `?format=csv` (default) or `?format=json`. */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ req, params, member }) => {
  const format = new URL(req.url).searchParams.get('format') ?? 'csv';
  if (format !== 'csv' && format !== 'json')
    throw invalidFields([{ path: 'format', message: 'The format must be csv or json.' }]);
  const record = await getScreening({ workspaceId: member.workspace.id }, idParam(params.id));
  const stem = fileStem(record);
  if (format === 'json') {
    const uncertainty = uncertaintyFor(record.input, record.result);
    const result = uncertainty ? { ...record.result, uncertainty } : record.result;
    const body = JSON.stringify(
      { id: record.id, name: record.name, createdAt: record.createdAt, input: record.input, result },
      null,
      2,
    );
    return new Response(body, {
      status: 200,
      headers: {
        'content-type': 'application/json; charset=utf-8',
        'content-disposition': `attachment; filename="${stem}.json"`,
      },
    });
  }
  return new Response(`\ufeff${toCsv(record)}`, {
    status: 200,
    headers: {
      'content-type': 'text/csv; charset=utf-8; header=present',
      'content-disposition': `attachment; filename="${stem}.csv"`,
    },
  });
});
