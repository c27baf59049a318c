import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { parseTrackCsv, prepareTrackFlights } from '@/lib/imports/tracks';
import type { AircraftForScreening } from '@/db/aircraft-lookup';

const read = (text: string | Buffer) =>
  parseTrackCsv(Readable.from([Buffer.isBuffer(text) ? text : Buffer.from(text)]));

const aircraft = new Map<string, AircraftForScreening>([
  [
    'T-1',
    {
      id: 1,
      code: 'T-1',
      engineCount: 2,
      typicalMach: 0.84,
      typicalFlightLevel: 370,
      defaultFleetId: null,
      emission: { eiNoxGPerKg: 14 },
    },
  ],
]);

describe('reading a track file', () => {
  it('a time earlier than the one before is past midnight: the next day, in order (the last line has no line end)', async () => {
    const p = await read(
      [
        '\uFEFFFlight,Date,Time,Lat,Lon,Flight_Level,Fuel_Flow_kg_h,Aircraft,Origin,Destination',
        'X1,2026-11-03,23:50:00,60,10,FL370,6000,T-1,ENGM,BIKF',
        'X1,2026-11-03,23:58:00,60.8,9,370,6000,T-1,ENGM,BIKF',
        'X1,2026-11-03,00:06:00,61.6,8,370,6000,T-1,ENGM,BIKF',
      ].join('\n'),
    );
    expect(p.problems).toEqual([]);
    expect(p.flights).toHaveLength(1);
    const f = p.flights[0];
    expect(f.timeMs.at(2) - f.timeMs.at(1)).toBe(8 * 60_000);
    expect(f.level.at(0)).toBe(370);
    const prepared = prepareTrackFlights(p, { aircraft, planned: new Map(), flownKeys: new Set() });
    expect(prepared.problems).toEqual([]);
    const input = JSON.parse(prepared.flights[0].inputJson);
    expect(input.route.track.points[2].time).toBe('2026-11-04T00:06:00.000Z');
    // 16 minutes at 6000 kg/h: 1600 kg from the points' own fuel flow.
    expect(prepared.flights[0].fuelKg).toBeCloseTo(1600, 9);
    expect([prepared.flights[0].cruiseFl, prepared.flights[0].maxFl]).toEqual([370, 370]);
  });

  it('unknown columns are noted, not refused; a file that is not UTF-8 is refused as a whole', async () => {
    const p = await read('flight,date,time,lat,lon,altitude_ft,squawk\nX1,2026-11-03,10:00:00,60,10,37000,7000\n');
    expect(p.warnings).toEqual([expect.objectContaining({ line: 1, column: 'squawk' })]);
    const bad = await read(Buffer.from([0x66, 0x6c, 0x69, 0x67, 0x68, 0x74, 0x0a, 0xff, 0xfe, 0x0a]));
    expect(bad.problems).toEqual([expect.objectContaining({ line: 0 })]);
  });

  it.each([
    ['a time without seconds', 'X1,2026-11-03,10:00,60,10,37000', 'time'],
    ['a day that does not exist', 'X1,2026-02-30,10:00:00,60,10,37000', 'date'],
    ['a longitude as text', 'X1,2026-11-03,10:00:00,60,east,37000', 'lon'],
    ['a negative altitude', 'X1,2026-11-03,10:00:00,60,10,-300', 'altitude_ft'],
    ['no flight number', ',2026-11-03,10:00:00,60,10,37000', 'flight'],
  ])('%s is a problem on its line and column', async (_, row, column) => {
    const p = await read(`flight,date,time,lat,lon,altitude_ft\nX1,2026-11-03,09:59:00,60,10,37000\n${row}\n`);
    expect(p.problems).toContainEqual(expect.objectContaining({ line: 3, column }));
  });
});

describe('the cruise level listed for a flown flight', () => {
  it('is the level most points were flown at, not the first level near the top of the climb', async () => {
    const rows = ['flight,date,time,lat,lon,altitude_ft,fuel_flow_kg_h'];
    const alts = [5000, 20000, 35300, 37000, 37000, 37000, 39000, 39000, 20000];
    alts.forEach((a, i) =>
      rows.push(`X1,2026-11-03,10:${String(i * 6).padStart(2, '0')}:00,${60 + i * 0.5},10,${a},6000`),
    );
    const p = await read(rows.join('\n') + '\n');
    const planned = new Map([
      [
        '2026-11-03|X1',
        [
          {
            id: 1,
            date: '2026-11-03',
            flight: 'X1',
            origin: 'ENGM',
            destination: 'BIKF',
            aircraftCode: 'T-1',
            fuelKg: 1,
          },
        ],
      ],
    ]);
    const prepared = prepareTrackFlights(p, { aircraft, planned, flownKeys: new Set() });
    expect(prepared.problems).toEqual([]);
    expect([prepared.flights[0].cruiseFl, prepared.flights[0].maxFl]).toEqual([370, 390]);
    expect([prepared.flights[0].origin, prepared.flights[0].aircraftCode]).toEqual(['ENGM', 'T-1']);
  });
});
