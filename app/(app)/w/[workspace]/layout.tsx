import { requireMember } from '@/lib/auth/guards';
import { listWorkspacesForUser } from '@/db/workspaces';
import { TopBar } from '@/components/shell/top-bar';
import { WorkspaceNav } from '@/components/shell/workspace-nav';
import { WorkspaceSwitcher } from '@/components/shell/workspace-switcher';
import { MobileNav } from '@/components/shell/mobile-nav';

export default async function WorkspaceLayout({ children, params }: { children: React.ReactNode; params: Promise<{ workspace: string }> }) {
  const { workspace: slug } = await params;
  const { user, role } = await requireMember(slug);
  const memberships = await listWorkspacesForUser({ userId: user.id });
  const switcher = <WorkspaceSwitcher current={slug} options={memberships.map((m) => ({ slug: m.workspace.slug, name: m.workspace.name, role: m.role }))} />;
  return (
    <div className="min-h-screen">
      <TopBar
        user={user}
        menu={
          <MobileNav>
            <div className="mb-4 sm:hidden">{switcher}</div>
            <WorkspaceNav slug={slug} role={role} label="Workspace (menu)" />
          </MobileNav>
        }
      >
        {switcher}
      </TopBar>
      <div className="mx-auto flex max-w-[1400px] gap-6 px-4 py-6">
        <aside className="hidden w-52 shrink-0 md:block">
          <WorkspaceNav slug={slug} role={role} />
        </aside>
        <main id="main" className="min-w-0 flex-1">
          {children}
        </main>
      </div>
    </div>
  );
}
