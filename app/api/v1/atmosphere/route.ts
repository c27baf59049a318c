import { authedRoute, json } from '@/lib/api/route';
import { flightLevelToMetres, isa } from '@/lib/screening';
import { atmosphereQuerySchema } from '@/lib/validation/screening-api';
import { fromZod } from '@/lib/errors';

/** ICAO standard atmosphere at a flight level (pressure altitude) or a geopotential altitude. */
export const GET = authedRoute(async ({ req }) => {
  const q = atmosphereQuerySchema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) throw fromZod(q.error);
  const altitudeM = q.data.altitudeM ?? flightLevelToMetres(q.data.flightLevel ?? 0);
  const s = isa(altitudeM);
  return json({ ...s, altitudeM, flightLevel: altitudeM / 30.48, pressureHpa: s.pressurePa / 100 });
});
