import { requireMember } from '@/lib/auth/guards';
import { listApiKeys } from '@/db/api-keys';
import { Card, PageHeader } from '@/components/ui/card';
import { ROLE_LABELS } from '@/lib/auth/policy';
import { formatDateTime } from '@/lib/format';
import { CreateKeyForm, RevokeKeyButton } from './key-forms';

export const metadata = { title: 'API keys' };

export default async function ApiKeysPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace } = await requireMember(slug, 'apikeys:manage');
  const keys = await listApiKeys({ workspaceId: workspace.id });
  return (
    <>
      <PageHeader
        title="API keys"
        lead="A key acts only in this workspace, with the role it was given. Send it as “Authorization: Bearer <key>” to /api/v1. The key is shown once when created; only its fingerprint is kept."
      />
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <Card title="Active keys">
          {keys.length === 0 ? (
            <p className="text-sm text-ink-soft">No keys yet. Create one for a planning system or a script.</p>
          ) : (
            <table className="w-full text-sm">
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th className="py-2">Name</th>
                  <th className="py-2">Role</th>
                  <th className="py-2">Starts with</th>
                  <th className="py-2">Last used</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {keys.map((k) => (
                  <tr key={k.id} className="border-t border-line">
                    <td className="py-2">{k.name}</td>
                    <td className="py-2">{ROLE_LABELS[k.role]}</td>
                    <td className="py-2 font-mono text-xs">{k.prefix}…</td>
                    <td className="py-2 text-ink-soft">{formatDateTime(k.lastUsedAt)}</td>
                    <td className="py-2 text-right">
                      <RevokeKeyButton slug={slug} id={k.id} name={k.name} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </Card>
        <Card title="New key">
          <CreateKeyForm slug={slug} />
        </Card>
      </div>
    </>
  );
}
