import { redirect } from 'next/navigation';
import { requireUser } from '@/lib/auth/guards';
import { listWorkspacesForUser } from '@/db/workspaces';
import { landingPath } from '@/lib/auth/landing';

/** Where a user lands after signing in: one workspace -> it (finance admins on billing); several -> the portfolio. */
export default async function StartPage() {
  const user = await requireUser();
  const memberships = await listWorkspacesForUser({ userId: user.id });
  redirect(landingPath(memberships));
}
