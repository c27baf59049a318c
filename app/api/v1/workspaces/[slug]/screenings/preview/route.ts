import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { parseScreeningBody, runMonthSweep, runScreening, runWhatIf } from '@/lib/screening-service/service';
import { limitPreview } from '@/lib/auth/throttle';
import { z } from 'zod';

/** Screens without saving (not billed, throttled) and adds the what-if cruise levels; `months: true` adds the month sweep. */
export const POST = workspaceRoute<{ slug: string }>('screenings:create', async ({ req, member, principal }) => {
  await limitPreview(principal.kind === 'user' ? `u:${principal.user.id}` : `k:${principal.key.keyId}`);
  const raw = await readJson(req, z.unknown());
  const parsed = await parseScreeningBody(raw, { workspaceId: member.workspace.id });
  const result = runScreening(parsed.input, parsed.library, parsed.aircraftCode);
  const levels = runWhatIf(parsed.input, parsed.whatIf, result, parsed.library);
  const months = parsed.months === true ? runMonthSweep(parsed.input, parsed.library) : undefined;
  return json({ input: parsed.input, aircraft: parsed.aircraftCode, result, levels, ...(months ? { months } : {}) });
});
