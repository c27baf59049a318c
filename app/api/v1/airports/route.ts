import { authedRoute, json } from '@/lib/api/route';
import { searchAirports } from '@/lib/screening';
import { airportQuerySchema } from '@/lib/validation/screening-api';
import { fromZod } from '@/lib/errors';

/** Airport type-ahead: ICAO/IATA code prefix first, then name; at most 20. */
export const GET = authedRoute(async ({ req }) => {
  const q = airportQuerySchema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) throw fromZod(q.error);
  const items = searchAirports(q.data.q, q.data.limit ?? 20).map((a) => ({
    icao: a.icao,
    iata: a.iata,
    name: a.name,
    country: a.country,
    lat: a.lat,
    lon: a.lon,
  }));
  return json({ items });
});
