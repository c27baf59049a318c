'use server';

import { requireActionUser } from '@/lib/auth/guards';
import { acceptInvitation } from '@/db/workspaces';
import { toActionState, type ActionState } from '@/lib/errors';

export async function acceptInvitationAction(token: string): Promise<ActionState<{ next: string }>> {
  try {
    const user = await requireActionUser();
    const ws = await acceptInvitation({ token: String(token), userId: user.id, email: user.email });
    return { ok: true, data: { next: `/w/${ws.slug}` } };
  } catch (err) {
    return toActionState(err);
  }
}
