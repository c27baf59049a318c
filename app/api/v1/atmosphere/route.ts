import { authedRoute, json, readQuery } from '@/lib/api/handler';
import { flightLevelToMetres, isa } from '@/lib/screening';
import { atmosphereQuerySchema } from '@/lib/validation/screening-api';

/** ICAO standard atmosphere at a flight level (pressure altitude) or a geopotential altitude. */
export const GET = authedRoute(async ({ req }) => {
  const query = readQuery(req, atmosphereQuerySchema);
  const altitudeM = query.altitudeM ?? flightLevelToMetres(query.flightLevel ?? 0);
  const s = isa(altitudeM);
  return json({ ...s, altitudeM, flightLevel: altitudeM / 30.48, pressureHpa: s.pressurePa / 100 });
});
