import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { ensureBilling } from '@/lib/billing/trial';
import { listInvoices, updateBillingEmail } from '@/lib/billing/service';
import { publicBillingState } from '@/lib/billing/state';
import { billingEmailSchema } from '@/lib/validation/billing';
import { forbidden } from '@/lib/errors';

/** Plan, status, period, billing e-mail, card on file and invoices (null while the payment service is unreachable). */
export const GET = workspaceRoute<{ slug: string }>('billing:read', async ({ member }) => {
  const billing = await ensureBilling({ workspaceId: member.workspace.id });
  const invoices = await listInvoices(billing).catch(() => null);
  return json({ ...publicBillingState(billing), invoices });
});

/** Sets the billing e-mail (empty: payment problems go to the owners and finance admins only). */
export const PATCH = workspaceRoute<{ slug: string }>('billing:manage', async ({ member, req, userId, actorLabel }) => {
  const input = await readJson(req, billingEmailSchema);
  if (userId === null) throw forbidden('Billing changes need a signed-in owner or finance admin.');
  await updateBillingEmail(
    member.workspace,
    { userId, email: actorLabel },
    input.billingEmail === '' ? null : input.billingEmail,
  );
  return json(publicBillingState(await ensureBilling({ workspaceId: member.workspace.id })));
});
