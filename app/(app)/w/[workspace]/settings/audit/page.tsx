import { requireMember } from '@/lib/auth/guards';
import { listAuditEntries } from '@/db/audit';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';

export const metadata = { title: 'Audit log' };

export default async function AuditPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace: slug } = await params;
  const { workspace } = await requireMember(slug, 'audit:read');
  const rows = await listAuditEntries({ workspaceId: workspace.id }, { limit: 200 });
  return (
    <>
      <PageHeader title="Audit log" lead="Membership, key and billing changes in this workspace, newest first (last 200)." />
      {rows.length === 0 ? (
        <EmptyState title="Nothing recorded yet" />
      ) : (
        <Card>
          <table className="w-full text-sm">
            <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
              <tr>
                <th className="py-2">When</th>
                <th className="py-2">Who</th>
                <th className="py-2">What</th>
                <th className="py-2">Target</th>
                <th className="py-2">Detail</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-line">
                  <td className="py-1.5 pr-3 whitespace-nowrap text-ink-soft">{formatDateTime(r.createdAt)}</td>
                  <td className="py-1.5 pr-3">{r.actor ?? '—'}</td>
                  <td className="py-1.5 pr-3 font-mono text-xs">{r.action}</td>
                  <td className="py-1.5 pr-3">{r.target ?? ''}</td>
                  <td className="py-1.5 font-mono text-xs text-ink-soft">{r.detail ? JSON.stringify(r.detail) : ''}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      )}
    </>
  );
}
