import { redirect } from 'next/navigation';
import { requireUser } from '@/lib/auth/guards';
import { listWorkspacesForUser } from '@/db/workspaces';
import { resolveAfterSignIn } from '@/lib/auth/landing';
import { safeCallbackPath } from '@/lib/auth/callback';
import { appUrl } from '@/lib/env';

/**
 * Where a user lands after signing in: the link they followed when their role can see it; otherwise one
 * workspace -> it (finance admins on billing), several -> the portfolio.
 */
export default async function StartPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requireUser();
  const sp = await searchParams;
  const next = typeof sp.next === 'string' ? safeCallbackPath(sp.next, appUrl()) : null;
  const memberships = await listWorkspacesForUser({ userId: user.id });
  redirect(resolveAfterSignIn(next, memberships));
}
