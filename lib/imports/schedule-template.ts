import { SCHEDULE_COLUMNS } from '@/lib/validation/imports';

/**
 * The template offered on the imports page: the header row and a few example rows that use the
 * workspace's own aircraft type codes and fleet names, so the file imports as it is.
 */
export function scheduleTemplateCsv(opts: { aircraft: string[]; fleets: string[]; day: string }): string {
  const a = opts.aircraft[0] ?? 'YOUR-TYPE';
  const b = opts.aircraft[1] ?? a;
  const fleet = opts.fleets[0] ?? '';
  const d = opts.day;
  const rows: string[][] = [
    [d, 'XY101', 'EFHK', 'RJAA', a, '370', '52400', '350@0 370@2600 390@5200', '', '', '', ''],
    [d, 'XY102', 'RJAA', 'EFHK', a, '380', '53100', '', '', '', '', ''],
    [d, 'XY215', 'LHR', 'SEA', b, 'FL390', '48800', '', fleet, '', '0.84', ''],
    [d, 'XY330', 'KEF', 'ANC', a, '360', '36200', '', '', '13.8', '', ''],
    [
      d,
      'XY118',
      'EGLL',
      'CYYZ',
      a,
      '370',
      '41500',
      '',
      '',
      '',
      '',
      'N0480F370 DCT 57N020W 58N030W 57N040W/N0480F390 DCT',
    ],
  ];
  const cell = (v: string) => (/[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v);
  return [SCHEDULE_COLUMNS.join(','), ...rows.map((r) => r.map(cell).join(','))].join('\r\n') + '\r\n';
}
