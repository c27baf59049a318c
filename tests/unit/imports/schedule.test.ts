import { describe, expect, it } from 'vitest';
import { parseSchedule, screeningInputOf, type ScheduleContext } from '@/lib/imports/schedule';
import { validateScreeningInput } from '@/lib/screening';
import { scheduleTemplateCsv } from '@/lib/imports/schedule-template';
import type { AircraftForScreening } from '@/db/aircraft-lookup';

// Invented engine data (plausible certification-style values, not a real engine).
const ENGINE: AircraftForScreening['emission'] = {
  engine: { fuelFlowKgS: [0.1, 0.32, 0.98, 1.2], eiNoxGPerKg: [4.6, 10.2, 22.4, 28.1] },
  engineCount: 2,
  mach: 0.84,
};

const CTX: ScheduleContext = {
  aircraft: new Map<string, AircraftForScreening>([
    [
      'T-LR',
      {
        id: 1,
        code: 'T-LR',
        engineCount: 2,
        typicalMach: 0.84,
        typicalFlightLevel: 370,
        defaultFleetId: 10,
        emission: ENGINE,
      },
    ],
    [
      'T-SST',
      {
        id: 2,
        code: 'T-SST',
        engineCount: 4,
        typicalMach: 1.7,
        typicalFlightLevel: 580,
        defaultFleetId: null,
        emission: { eiNoxGPerKg: 11.5 },
      },
    ],
    [
      'T-BARE',
      {
        id: 3,
        code: 'T-BARE',
        engineCount: 2,
        typicalMach: 0.8,
        typicalFlightLevel: 350,
        defaultFleetId: null,
        emission: null,
      },
    ],
  ]),
  fleets: new Map([
    ['long haul', { id: 10, name: 'Long haul' }],
    ['study', { id: 11, name: 'Study' }],
  ]),
};

const HEADER = 'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg';

function streamOf(text: string | Uint8Array, chunk = 7): ReadableStream<Uint8Array> {
  const bytes = typeof text === 'string' ? new TextEncoder().encode(text) : text;
  let at = 0;
  // Small chunks split lines and multi-byte characters, as a network upload can.
  return new ReadableStream<Uint8Array>({
    pull(controller) {
      if (at >= bytes.length) return controller.close();
      controller.enqueue(bytes.slice(at, at + chunk));
      at += chunk;
    },
  });
}

const parse = (text: string | Uint8Array, ctx = CTX) => parseSchedule(streamOf(text), ctx);

describe('parseSchedule: reading the file', () => {
  it('reads a BOM, headers in any case and order, IATA codes, an FL prefix and a step climb', async () => {
    const text =
      '\uFEFFFuel_KG,Aircraft,DATE,flight,Origin,destination,Cruise_FL,STEPS,Mach\r\n' +
      '52400,t-lr,2026-11-03,sk 1,hel,NRT,FL370,350@0 FL370@2600 390@5200,0.82\r\n';
    const r = await parse(text);
    expect(r.problems).toEqual([]);
    expect(r.flights).toHaveLength(1);
    const f = r.flights[0];
    expect(f).toMatchObject({
      line: 2,
      date: '2026-11-03',
      flight: 'SK 1',
      origin: 'EFHK',
      destination: 'RJAA',
      aircraftCode: 'T-LR',
      fleetId: 10,
      cruiseFl: 350,
      maxFl: 390,
      fuelKg: 52_400,
    });
    const input = screeningInputOf(f);
    // What is stored is a valid screening input as it stands.
    expect(validateScreeningInput(JSON.parse(JSON.stringify(input)))).toEqual(input);
    expect(input.cruise).toEqual({
      steps: [
        { flightLevel: 350, fromKm: 0 },
        { flightLevel: 370, fromKm: 2600 },
        { flightLevel: 390, fromKm: 5200 },
      ],
    });
    expect(input.route).toEqual({ waypoints: [{ airport: 'EFHK' }, { airport: 'RJAA' }] });
    expect(input.mach).toBe(0.82);
    expect(input.emission).toEqual(ENGINE);
    expect(input.flightDate).toBe('2026-11-03');
  });

  it('takes the EI and Mach of the aircraft type unless the row gives its own; the fleet column wins over the default', async () => {
    const r = await parse(
      [
        `${HEADER},fleet,ei_nox_g_per_kg,mach`,
        '2026-11-03,A1,KEF,ANC,T-SST,560,36200,,,',
        '2026-11-03,A2,KEF,ANC,T-LR,370,36200,study,13.8,',
      ].join('\n'),
    );
    expect(r.problems).toEqual([]);
    const [a, b] = r.flights.map((f) => ({ ...f, input: screeningInputOf(f) }));
    expect(a.input).toMatchObject({ emission: { eiNoxGPerKg: 11.5 }, mach: 1.7 });
    expect(a.fleetId).toBeNull();
    expect(b.input).toMatchObject({ emission: { eiNoxGPerKg: 13.8 }, mach: 0.84 });
    expect(b.fleetId).toBe(11);
  });

  it('counts blank lines in line numbers but not as flights; a quoted cell may hold commas and quotes', async () => {
    const r = await parse(
      [
        HEADER,
        '',
        '2026-11-03,"A,1",EFHK,RJAA,T-LR,370,52400',
        ',,,,,,',
        '2026-11-03,A2,EFHK,RJAA,T-LR,999,52400',
      ].join('\n'),
    );
    expect(r.dataRows).toBe(2);
    expect(r.flights.map((f) => [f.line, f.flight])).toEqual([[3, 'A,1']]);
    expect(r.problems).toEqual([
      { line: 5, column: 'cruise_fl', message: 'The flight level must be between 0 and 660.' },
    ]);
  });

  it('reports unknown and unnamed columns as warnings and ignores their cells', async () => {
    const r = await parse([`${HEADER},gate,`, '2026-11-03,A1,EFHK,RJAA,T-LR,370,52400,B12,x'].join('\n'));
    expect(r.problems).toEqual([]);
    expect(r.flights).toHaveLength(1);
    expect(r.warnings.map((w) => [w.line, w.column])).toEqual([
      [1, 'gate'],
      [1, '(column 9)'],
    ]);
  });

  it('refuses a header with a missing or repeated column, an empty file and bytes that are not UTF-8', async () => {
    expect(
      (
        await parse('date,flight,origin,destination,aircraft,fuel_kg,date\n2026-11-03,A1,EFHK,RJAA,T-LR,5\n')
      ).problems.map((p) => [p.line, p.column]),
    ).toEqual([
      [1, 'date'],
      [1, 'cruise_fl'],
    ]);
    expect((await parse('')).problems[0]).toMatchObject({ line: 1, message: expect.stringContaining('empty') });
    const latin1 = new Uint8Array([
      ...new TextEncoder().encode(`${HEADER}\n2026-11-03,A1,EFHK,RJAA,T-LR,370,52400,`),
      0xe9,
      0x0a,
    ]);
    expect((await parse(latin1)).problems).toEqual([
      { line: 0, column: '', message: expect.stringContaining('not UTF-8') },
    ]);
  });

  it('a line with more cells than the header is a problem', async () => {
    const r = await parse([HEADER, '2026-11-03,A1,EFHK,RJAA,T-LR,370,52400,oops'].join('\n'));
    expect(r.problems).toEqual([
      { line: 2, column: '', message: expect.stringContaining('8 cells but the header has 7') },
    ]);
  });
});

describe('parseSchedule: each bad cell is named by its column', () => {
  const good = {
    date: '2026-11-03',
    flight: 'A1',
    origin: 'EFHK',
    destination: 'RJAA',
    aircraft: 'T-LR',
    cruise_fl: '370',
    fuel_kg: '52400',
    steps: '',
    fleet: '',
    ei_nox_g_per_kg: '',
    mach: '',
  };
  const cases: [string, Partial<typeof good>, string, RegExp][] = [
    ['a date that is not YYYY-MM-DD', { date: '03/11/2026' }, 'date', /YYYY-MM-DD/],
    ['a date not in the calendar', { date: '2026-02-30' }, 'date', /does not exist/],
    ['an empty flight number', { flight: '' }, 'flight', /flight number/],
    ['a flight number over 16 characters', { flight: 'X'.repeat(17) }, 'flight', /16 characters/],
    ['an unknown origin', { origin: 'QQQQ' }, 'origin', /Unknown airport/],
    ['a malformed destination', { destination: 'RJ-A' }, 'destination', /ICAO/],
    ['the same airport twice', { destination: 'HEL' }, 'destination', /origin airport/],
    ['an aircraft type not in the workspace', { aircraft: 'NOPE' }, 'aircraft', /No aircraft type/],
    ['a type with neither engine nor EI', { aircraft: 'T-BARE' }, 'aircraft', /neither engine data nor a direct EI/],
    ['a fractional flight level', { cruise_fl: '370.5' }, 'cruise_fl', /whole flight level/],
    ['no cruise level and no steps', { cruise_fl: '' }, 'cruise_fl', /cruise flight level/],
    ['fuel with a unit', { fuel_kg: '52 t' }, 'fuel_kg', /number/],
    ['fuel below 1 kg', { fuel_kg: '0.5' }, 'fuel_kg', /between 1 and 500000/],
    [
      'steps not starting at 0 km',
      { steps: '350@10 370@2000' },
      'steps',
      /^Step 1 \(350@10\): The first cruise step must start at 0 km/,
    ],
    [
      'steps going backwards',
      { steps: '350@0 370@2000 390@1500' },
      'steps',
      /^Step 3 \(390@1500\): Each cruise step must start further/,
    ],
    ['a step above FL660', { steps: '350@0 700@2000' }, 'steps', /^Step 2 .*between 0 and 660/],
    ['a step that is not FL@km', { steps: '350-0' }, 'steps', /flight level@km/],
    ['an unknown fleet', { fleet: 'Ghost' }, 'fleet', /No fleet “Ghost”/],
    ['an EI above 200 g/kg', { ei_nox_g_per_kg: '250' }, 'ei_nox_g_per_kg', /between 0 and 200/],
    ['a Mach above 3', { mach: '3.5' }, 'mach', /between 0.1 and 3/],
  ];
  it.each(cases)('%s', async (_label, patch, column, message) => {
    const row = { ...good, ...patch };
    const header = Object.keys(good).join(',');
    const r = await parse(`${header}\n${Object.values(row).join(',')}\n`);
    expect(r.flights).toEqual([]);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0]).toMatchObject({ line: 2, column });
    expect(r.problems[0].message).toMatch(message);
  });

  it('a flight twice in the file is refused on its second line, naming the first', async () => {
    const r = await parse(
      [HEADER, '2026-11-03,A1,EFHK,RJAA,T-LR,370,52400', '2026-11-03,a1,HEL,NRT,T-LR,390,51000'].join('\n'),
    );
    expect(r.flights).toHaveLength(1);
    expect(r.problems).toEqual([{ line: 3, column: 'flight', message: expect.stringContaining('already on line 2') }]);
  });
});

describe('the schedule template', () => {
  it('parses without a problem using the codes it was made with', async () => {
    const text = scheduleTemplateCsv({ aircraft: ['T-LR', 'T-SST'], fleets: ['Long haul'], day: '2026-11-20' });
    const r = await parse(text);
    expect(r.problems).toEqual([]);
    expect(r.warnings).toEqual([]);
    expect(r.flights.map((f) => f.aircraftCode)).toEqual(['T-LR', 'T-LR', 'T-SST', 'T-LR', 'T-LR']);
    expect(r.flights[4].maxFl).toBe(390);
  });
});

describe('parseSchedule: the optional route column (ICAO flight-plan route)', () => {
  const LIB: ScheduleContext = {
    ...CTX,
    library: { fixes: [{ name: 'QXORV', lat: 64, lon: -20 }], airways: [] },
  };

  it('reads the route through the library, flies its levels instead of cruise_fl, and stores the placed waypoints', async () => {
    const text = `${HEADER},route\n2026-11-03,SK 7,EFHK,KSEA,T-LR,350,52400,"N0480F350 DCT QXORV 66N040W/N0480F370 DCT"\n`;
    const r = await parse(text, LIB);
    expect(r.problems).toEqual([]);
    const f = r.flights[0];
    expect(f.cruiseFl).toBe(350);
    expect(f.maxFl).toBe(370);
    const input = screeningInputOf(f);
    expect(validateScreeningInput(JSON.parse(JSON.stringify(input)))).toEqual(input);
    if (!('waypoints' in input.route)) throw new Error('expected waypoints');
    expect(input.route.waypoints).toHaveLength(4);
    expect(input.route.waypoints[1]).toEqual({ lat: 64, lon: -20 });
    expect('steps' in input.cruise && input.cruise.steps.map((s) => s.flightLevel)).toEqual([350, 370]);
  });

  it('a route item that cannot be placed is a problem in the route column, naming the item and its place', async () => {
    const text = `${HEADER},route\n2026-11-03,SK 8,EFHK,KSEA,T-LR,350,52400,N0480F350 DCT NOWHR DCT\n`;
    const r = await parse(text, LIB);
    expect(r.flights).toEqual([]);
    expect(r.problems).toEqual([
      {
        line: 2,
        column: 'route',
        message: expect.stringContaining('NOWHR (character 15): NOWHR is not in the fix library.'),
      },
    ]);
  });

  it('without a route the row is unchanged (the great circle between the airports)', async () => {
    const r = await parse(`${HEADER},route\n2026-11-03,SK 9,EFHK,KSEA,T-LR,350,52400,\n`, LIB);
    expect(r.problems).toEqual([]);
    expect(screeningInputOf(r.flights[0]).route).toEqual({ waypoints: [{ airport: 'EFHK' }, { airport: 'KSEA' }] });
  });
});
