import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { ensureBilling } from '@/lib/billing/trial';
import { setPaymentCard } from '@/lib/billing/service';
import { publicBillingState } from '@/lib/billing/state';
import { cardChoiceSchema } from '@/lib/validation/billing';
import { forbidden } from '@/lib/errors';

/** Puts one of the two test cards on file for future invoices (card: "succeeds" or "declined"). */
export const PUT = workspaceRoute<{ slug: string }>('billing:manage', async ({ member, req, userId, actorLabel }) => {
  const input = await readJson(req, cardChoiceSchema);
  if (userId === null) throw forbidden('Billing changes need a signed-in owner or finance admin.');
  await setPaymentCard(member.workspace, { userId, email: actorLabel }, input.card);
  return json(publicBillingState(await ensureBilling({ workspaceId: member.workspace.id })));
});
