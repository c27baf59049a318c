import { forbidden, notFound, redirect } from 'next/navigation';
import { detailItemExists } from '@/db/item-exists';
import { isDocumentRequest, requestedPath, requireMember } from '@/lib/auth/guards';
import { workspaceLanding, workspacePageOf } from '@/lib/auth/landing';
import { can } from '@/lib/auth/policy';
import { listWorkspacesForUser } from '@/db/workspaces';
import { TopBar } from '@/components/shell/top-bar';
import { WorkspaceNav } from '@/components/shell/workspace-nav';
import { WorkspaceSwitcher } from '@/components/shell/workspace-switcher';
import { RoleNotice } from '@/components/shell/role-notice';
import { Suspense } from 'react';
import { MobileNav } from '@/components/shell/mobile-nav';

export default async function WorkspaceLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ slug: string }>;
}) {
  const { slug } = await params;
  const { user, role, workspace } = await requireMember(slug);
  // Checked here as well as in each page: pages with a loading screen stream inside it, and a refusal
  // raised there would already have answered 200. The layout is part of the first flush, so this is a 403.
  // Only on a full page load: a client navigation or a server action re-rendering this page after a
  // delete must reach the page's own not-found screen, not stop in the shared layout.
  const asked = (await isDocumentRequest()) ? await requestedPath() : null;
  const page = asked ? workspacePageOf(asked) : null;
  if (page?.permission && page.slug === slug && !can(role, page.permission)) {
    const landing = workspaceLanding(slug, role);
    if (asked?.split(/[?#]/)[0].replace(/\/+$/, '') === `/w/${slug}` && landing !== `/w/${slug}`) redirect(landing);
    forbidden();
  }
  // Likewise a detail page whose item is not in this workspace: a 404 before anything streams.
  if (asked && (await detailItemExists({ workspaceId: workspace.id }, asked.split(/[?#]/)[0])) === false) notFound();
  const memberships = await listWorkspacesForUser({ userId: user.id });
  const switcher = (
    <WorkspaceSwitcher
      current={slug}
      options={memberships.map((m) => ({ slug: m.workspace.slug, name: m.workspace.name, role: m.role }))}
    />
  );
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
          <Suspense fallback={null}>
            <RoleNotice role={role} />
          </Suspense>
          {children}
        </main>
      </div>
    </div>
  );
}
