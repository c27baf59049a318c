import { z } from 'zod';
import { authedRoute, json, readJson } from '@/lib/api/handler';
import { tropopauseFromSounding } from '@/lib/screening';

/** WMO (1957) first lapse-rate tropopause of `{ levels }`; `{ tropopause: null }` when there is none. */
export const POST = authedRoute(async ({ req }) => {
  const body = await readJson(req, z.object({ levels: z.unknown() }, { error: 'Send { levels: [...] }.' }));
  const tropopause = tropopauseFromSounding(body.levels as Parameters<typeof tropopauseFromSounding>[0]);
  return json({ tropopause });
});
