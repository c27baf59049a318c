import { authedRoute, json, readQuery } from '@/lib/api/handler';
import { searchAirports } from '@/lib/screening';
import { airportQuerySchema } from '@/lib/validation/screening-api';

/** Airport type-ahead: ICAO/IATA code prefix first, then name; at most 20. */
export const GET = authedRoute(async ({ req }) => {
  const query = readQuery(req, airportQuerySchema);
  const items = searchAirports(query.q, query.limit ?? 20).map((a) => ({
    icao: a.icao,
    iata: a.iata,
    name: a.name,
    country: a.country,
    lat: a.lat,
    lon: a.lon,
  }));
  return json({ items });
});
