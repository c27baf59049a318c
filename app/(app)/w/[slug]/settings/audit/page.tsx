import { requireMember } from '@/lib/auth/guards';
import { listAuditEntries } from '@/db/audit';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { TableHead } from '@/components/ui/table-head';

export const metadata = { title: 'Audit log' };

export default async function AuditPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace } = await requireMember(slug, 'audit:read');
  const rows = await listAuditEntries({ workspaceId: workspace.id }, { limit: 200 });
  return (
    <>
      <PageHeader
        title="Audit log"
        lead="Membership, key and billing changes in this workspace, newest first (last 200)."
      />
      {rows.length === 0 ? (
        <EmptyState title="Nothing recorded yet" />
      ) : (
        <Card>
          {/* Long details (JSON without spaces) wrap inside their cell; on a phone the table scrolls in its frame. */}
          <ScrollRegion label="Audit log">
            <table className="w-full min-w-[900px] table-fixed text-sm">
              <colgroup>
                <col className="w-40" />
                <col className="w-48" />
                <col className="w-44" />
                <col className="w-40" />
                <col />
              </colgroup>
              <TableHead columns={['When', 'Who', 'What', 'Target', 'Detail']} gapOnLast />
              <tbody>
                {rows.map((r) => (
                  <tr key={r.id} className="border-t border-line">
                    <td className="py-1.5 pr-3 whitespace-nowrap text-ink-soft">{formatDateTime(r.createdAt)}</td>
                    <td className="py-1.5 pr-3 break-words">{r.actor ?? '—'}</td>
                    <td className="py-1.5 pr-3 font-mono text-xs break-words">{r.action}</td>
                    <td className="py-1.5 pr-3 break-words">{r.target ?? ''}</td>
                    <td className="py-1.5 font-mono text-xs text-ink-soft [overflow-wrap:anywhere]">
                      {r.detail ? JSON.stringify(r.detail) : ''}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </Card>
      )}
    </>
  );
}
