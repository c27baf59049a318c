import fc from 'fast-check';

/** Scalars that break naive parsers: wrong types, huge and tiny numbers, numeric strings, unicode. */
export const weirdScalar: fc.Arbitrary<unknown> = fc.oneof(
  fc.constant(null),
  fc.boolean(),
  fc.integer(),
  fc.double(),
  fc.constantFrom(1e308, -1e308, 1e21, 2 ** 53 + 2, -(2 ** 63), 5e-324, -0, 0.1, 999_999_999_999),
  fc.constantFrom(
    'NaN',
    'Infinity',
    '-Infinity',
    '1e999',
    '0x1F',
    '1_000',
    ' 42 ',
    '',
    '-',
    '١٢٣',
    '+1',
    '00012',
    '2147483648',
    '999999999999',
    '9007199254740993',
  ),
  fc.constantFrom(2_147_483_648, 999_999_999_999, -2_147_483_649),
  fc.string({ maxLength: 40 }),
  fc.string({ unit: 'grapheme', maxLength: 20 }),
  fc.string({ unit: 'binary', maxLength: 20 }),
  fc.constantFrom(
    '2026-02-30',
    '2026-13-01',
    '9999-99-99',
    'EGLL',
    'lhr',
    'FL370',
    'fl@0',
    '390@0 410@4000',
    '\u0000',
    '\uFEFFdate',
    '𝔉𝔏370',
    '<script>',
    "'; drop table users; --",
  ),
  fc.integer({ min: 1_000, max: 20_000 }).map((n) => 'x'.repeat(n)),
);

/** Any JSON-shaped value, with weird scalars at the leaves. */
export const weirdValue: fc.Arbitrary<unknown> = fc.letrec<{ v: unknown }>((tie) => ({
  v: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    weirdScalar,
    fc.array(tie('v'), { maxLength: 4 }),
    fc.dictionary(
      fc.oneof(
        fc.string({ maxLength: 12 }),
        fc.constantFrom(
          'name',
          'route',
          'waypoints',
          'lat',
          'lon',
          'airport',
          'cruise',
          'steps',
          'flightLevel',
          'fromKm',
          'levels',
          'id',
        ),
      ),
      tie('v'),
      { maxKeys: 4 },
    ),
  ),
})).v;

const PROTO_KEYS = ['__proto__', 'constructor', 'prototype'];

/** Raw JSON text: a seed's mutations, deep nesting, prototype-pollution keys, oversized and broken bodies. */
export function bodyText(seeds: unknown[]): fc.Arbitrary<string> {
  const seed = seeds.length ? fc.constantFrom(...seeds) : fc.constant({});
  return fc.oneof(
    {
      arbitrary: fc
        .tuple(
          seed,
          fc.array(fc.tuple(fc.nat(), weirdValue, fc.constantFrom('set', 'delete', 'wrap', 'stringify')), {
            minLength: 1,
            maxLength: 4,
          }),
        )
        .map(([s, muts]) => JSON.stringify(mutate(s, muts))),
      weight: 120,
    },
    { arbitrary: weirdValue.map((v) => JSON.stringify(v) ?? 'null'), weight: 60 },
    {
      arbitrary: fc
        .tuple(seed, fc.constantFrom(...PROTO_KEYS), fc.nat())
        .map(([s, k, n]) => withPrototypeKeys(s, k, n)),
      weight: 40,
    },
    {
      arbitrary: fc
        .tuple(fc.integer({ min: 100, max: 5_000 }), fc.constantFrom('[', '{"a":'))
        .map(([depth, open]) => deep(depth, open)),
      weight: 20,
    },
    {
      arbitrary: fc.tuple(seed, fc.nat()).map(([s, n]) => {
        const t = JSON.stringify(s);
        return t.slice(0, n % (t.length + 1));
      }),
      weight: 20,
    },
    { arbitrary: fc.string({ maxLength: 60 }), weight: 20 },
    {
      arbitrary: fc.constantFrom(
        '{"fuelBurnKg": NaN}',
        '{"a": Infinity}',
        '{"a": 1e999}',
        '[1,]',
        "{'a':1}",
        '\uFEFF{}',
        '{"a":"\\ud800"}',
        'null',
        '0',
        '"text"',
        'true',
      ),
      weight: 20,
    },
    { arbitrary: fc.constant(JSON.stringify({ name: 'x'.repeat(1_100_000) })), weight: 1 },
  );
}

/** Applies mutations at pseudo-random paths of a seed object. */
export function mutate(seed: unknown, muts: [number, unknown, 'set' | 'delete' | 'wrap' | 'stringify'][]): unknown {
  const copy = JSON.parse(JSON.stringify(seed ?? {})) as unknown;
  for (const [pick, value, op] of muts) {
    const paths = allPaths(copy);
    if (!paths.length) return value;
    const path = paths[pick % paths.length];
    const parent = path.slice(0, -1).reduce<unknown>((o, k) => (o as Record<string, unknown>)[k], copy) as Record<
      string,
      unknown
    >;
    const key = path[path.length - 1];
    if (op === 'delete') {
      if (Array.isArray(parent)) parent.splice(Number(key), 1);
      else delete parent[key];
    } else if (op === 'wrap') parent[key] = [parent[key]];
    else if (op === 'stringify') parent[key] = JSON.stringify(parent[key]) ?? 'undefined';
    else parent[key] = value;
  }
  return copy;
}

function allPaths(v: unknown, prefix: string[] = [], out: string[][] = []): string[][] {
  if (v && typeof v === 'object') {
    for (const k of Object.keys(v)) {
      out.push([...prefix, k]);
      allPaths((v as Record<string, unknown>)[k], [...prefix, k], out);
    }
  }
  return out;
}

/** JSON text with `"__proto__"` (or constructor / prototype) keys at the top and inside a nested object. */
function withPrototypeKeys(seed: unknown, key: string, n: number): string {
  const evil = key === 'constructor' ? '{"prototype":{"polluted":"yes"}}' : '{"polluted":"yes","isAdmin":true}';
  const text = JSON.stringify(seed ?? {});
  const top = text === '{}' ? `{"${key}":${evil}}` : `{"${key}":${evil},${text.slice(1)}`;
  if (n % 2 === 0) return top;
  return top.replace(/\{"(?!__proto__|constructor|prototype)([^"]+)":\{/, (m) => `${m}"${key}":${evil},`);
}

function deep(depth: number, open: string): string {
  return open === '[' ? '['.repeat(depth) + ']'.repeat(depth) : '{"a":'.repeat(depth) + '1' + '}'.repeat(depth);
}

/** Query strings over a route's documented keys and some others, with weird values and repeats. */
export function queryString(keys: string[]): fc.Arbitrary<string> {
  const key = fc.oneof(
    keys.length ? fc.constantFrom(...keys) : fc.constant('q'),
    fc.string({ maxLength: 8 }),
    fc.constantFrom('__proto__', 'constructor', 'limit', 'cursor'),
  );
  const value = weirdScalar.map((v) => (typeof v === 'string' ? v.slice(0, 3000) : String(v)));
  return fc.array(fc.tuple(key, value), { maxLength: 6 }).map((pairs) => new URLSearchParams(pairs).toString());
}

const CSV_HEADERS = [
  'date',
  'flight',
  'origin',
  'destination',
  'aircraft',
  'cruise_fl',
  'fuel_kg',
  'steps',
  'fleet',
  'ei_nox_g_per_kg',
  'mach',
  'name',
  'idle_ff_kg_s',
  'approach_ff_kg_s',
  'climb_out_ff_kg_s',
  'take_off_ff_kg_s',
  'idle_ei',
  'approach_ei',
  'climb_out_ei',
  'take_off_ei',
  'source',
  'altitude_m',
  'pressure_hpa',
  'temperature_k',
  'temperature_c',
  'DATE',
  ' Flight ',
  'unknown',
];

/** CSV files: plausible headers, weird cells, quotes, BOM, CRLF, ragged rows. */
export const csvText: fc.Arbitrary<string> = fc
  .tuple(
    fc.boolean(),
    fc.uniqueArray(fc.constantFrom(...CSV_HEADERS), { minLength: 0, maxLength: 12 }),
    fc.array(
      fc.array(
        fc.oneof(
          weirdScalar.map((v) => (typeof v === 'string' ? v.slice(0, 200) : String(v))),
          fc.constantFrom(
            '2026-11-02',
            'TP100',
            'EGLL',
            'KJFK',
            'SK-LR1',
            '370',
            'FL390',
            '52000',
            '370@0 390@3000',
            '"quoted, cell"',
            '"unterminated',
            '=cmd|x',
            '273.15',
            '-56.5',
            '250',
            '10000',
          ),
        ),
        { maxLength: 14 },
      ),
      { maxLength: 8 },
    ),
    fc.constantFrom('\n', '\r\n', '\r'),
  )
  .map(
    ([bom, header, rows, eol]) => (bom ? '\uFEFF' : '') + [header.join(','), ...rows.map((r) => r.join(','))].join(eol),
  );
