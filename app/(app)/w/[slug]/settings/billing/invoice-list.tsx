import type { BillingDto } from '@/db/billing';
import { listInvoices, type InvoiceDto } from '@/lib/billing/service';
import { EmptyState } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { formatDate, formatMoney } from '@/lib/format';
import { TableHead } from '@/components/ui/table-head';

const STATUS_LABELS: Record<string, { label: string; className: string }> = {
  paid: { label: 'Paid', className: 'bg-tropo-soft text-tropo-strong' },
  open: { label: 'Payment due', className: 'bg-danger-soft text-danger' },
  draft: { label: 'Draft', className: 'bg-paper-sunk text-ink-soft' },
  void: { label: 'Void', className: 'bg-paper-sunk text-ink-soft' },
  uncollectible: { label: 'Uncollectible', className: 'bg-danger-soft text-danger' },
};

function StatusTag({ status }: { status: string }) {
  const s = STATUS_LABELS[status] ?? { label: status, className: 'bg-paper-sunk text-ink-soft' };
  return <span className={`rounded px-2 py-0.5 text-xs font-medium ${s.className}`}>{s.label}</span>;
}

/** The workspace's invoices, read from the payment service when the page renders. */
export async function InvoiceList({ slug, billing }: { slug: string; billing: BillingDto }) {
  let invoices: InvoiceDto[];
  try {
    invoices = await listInvoices(billing);
  } catch {
    return (
      <Notice tone="caution" title="Invoices cannot be shown right now">
        The payment service did not answer. Reload the page in a minute; nothing is lost.
      </Notice>
    );
  }
  if (invoices.length === 0) {
    return (
      <EmptyState title="No invoices yet">
        {billing.subscriptionId
          ? `The first invoice is issued when the current period closes${billing.currentPeriodEnd ? ` on ${formatDate(billing.currentPeriodEnd)}` : ''}: the monthly fee plus the period's screened flights.`
          : 'Invoices start once the workspace is subscribed. A free trial is never invoiced.'}
      </EmptyState>
    );
  }
  return (
    <div className="relative overflow-x-auto">
      <table className="w-full text-sm">
        <caption className="sr-only">Invoices, newest first</caption>
        <TableHead columns={['Invoice', 'Period', { label: 'Amount', right: true }, 'Status', 'Document']} />
        <tbody>
          {invoices.map((inv) => (
            <tr key={inv.id} className="border-t border-line" data-testid="invoice-row">
              <td className="whitespace-nowrap py-2 pr-3 font-mono text-xs">{inv.number ?? inv.id}</td>
              <td className="figure py-2 pr-3">
                <span className="whitespace-nowrap">{formatDate(inv.periodStart)}</span> to{' '}
                <span className="whitespace-nowrap">{formatDate(inv.periodEnd)}</span>
              </td>
              <td className="figure whitespace-nowrap py-2 pr-3 text-right">
                {formatMoney(inv.amountDueCents)}
                {inv.status === 'open' && inv.amountRemainingCents > 0 ? (
                  <span className="block text-xs text-danger">{formatMoney(inv.amountRemainingCents)} unpaid</span>
                ) : null}
              </td>
              <td className="py-2 pr-3">
                <StatusTag status={inv.status} />
              </td>
              <td className="whitespace-nowrap py-2">
                {inv.hasPdf ? (
                  <a
                    className="font-medium text-accent underline-offset-2 hover:underline"
                    href={`/api/v1/workspaces/${encodeURIComponent(slug)}/invoices/${encodeURIComponent(inv.id)}/pdf`}
                    download
                  >
                    Download PDF<span className="sr-only"> of invoice {inv.number ?? inv.id}</span>
                  </a>
                ) : (
                  <span className="text-ink-faint">–</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
