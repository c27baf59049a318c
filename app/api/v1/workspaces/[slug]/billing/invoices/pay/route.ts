import { json, workspaceRoute } from '@/lib/api/handler';
import { ensureBilling } from '@/lib/billing/trial';
import { payOpenInvoices } from '@/lib/billing/service';
import { publicBillingState } from '@/lib/billing/state';
import { forbidden } from '@/lib/errors';

/** Charges the open invoices with the card on file; 402 when the card is declined again. */
export const POST = workspaceRoute<{ slug: string }>('billing:manage', async ({ member, userId, actorLabel }) => {
  if (userId === null) throw forbidden('Billing changes need a signed-in owner or finance admin.');
  const result = await payOpenInvoices(member.workspace, { userId, email: actorLabel });
  return json({ ...result, billing: publicBillingState(await ensureBilling({ workspaceId: member.workspace.id })) });
});
