import { requireMember } from '@/lib/auth/guards';
import { listMembers, listOpenInvitations } from '@/db/workspaces';
import { Card, PageHeader } from '@/components/ui/card';
import { ROLE_LABELS } from '@/lib/auth/policy';
import { formatDate } from '@/lib/format';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { InviteForm, MemberRow, RevokeInvitationButton } from './member-forms';

export const metadata = { title: 'Members' };

export default async function MembersPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace, user } = await requireMember(slug, 'members:manage');
  const [members, invitations] = await Promise.all([
    listMembers({ workspaceId: workspace.id }),
    listOpenInvitations({ workspaceId: workspace.id }),
  ]);
  return (
    <>
      <PageHeader title="Members" lead="Who can open this workspace, and what their role lets them do." />
      <Card title={`${members.length} member${members.length === 1 ? '' : 's'}`}>
        <ScrollRegion label="Members">
          <table className="w-full min-w-[520px] text-sm">
            <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
              <tr>
                <th className="py-2">Person</th>
                <th className="py-2">Role</th>
                <th className="py-2">Joined</th>
                <th className="py-2" />
              </tr>
            </thead>
            <tbody>
              {members.map((m) => (
                <MemberRow key={m.userId} slug={slug} member={m} isSelf={m.userId === user.id} />
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      </Card>
      <div className="mt-6 grid gap-6 lg:grid-cols-2">
        <Card title="Invite someone">
          <InviteForm slug={slug} />
        </Card>
        <Card title="Open invitations">
          {invitations.length === 0 ? (
            <p className="text-sm text-ink-soft">None waiting.</p>
          ) : (
            <ul className="divide-y divide-line text-sm">
              {invitations.map((i) => (
                <li key={i.id} className="flex items-center justify-between gap-3 py-2">
                  <span className="min-w-0 break-words">
                    {i.email} — {ROLE_LABELS[i.role]}
                    <span className="block text-xs text-ink-faint">valid until {formatDate(i.expiresAt)}</span>
                  </span>
                  <RevokeInvitationButton slug={slug} id={i.id} />
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </>
  );
}
