import { workspaceRoute } from '@/lib/api/handler';
import { ensureBilling } from '@/lib/billing/trial';
import { getInvoicePdf } from '@/lib/billing/service';

/**
 * An invoice's PDF, streamed through the app so only members who may read billing can fetch it; the
 * payment service's document address never reaches the browser.
 */
export const GET = workspaceRoute<{ slug: string; id: string }>('billing:read', async ({ member, params }) => {
  const billing = await ensureBilling({ workspaceId: member.workspace.id });
  const pdf = await getInvoicePdf(billing, params.id);
  return new Response(pdf.body, {
    status: 200,
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': `attachment; filename="${pdf.filename.replace(/[^A-Za-z0-9._-]/g, '_')}"`,
      'cache-control': 'private, no-store',
    },
  });
});
