'use server';

import { redirect } from 'next/navigation';
import { requireActionUser } from '@/lib/auth/guards';
import { acceptInvitation } from '@/lib/workspaces/service';
import { badRequest, toActionState, type ActionState } from '@/lib/errors';
import { formText } from '@/lib/validation/action-input';

/** Accepts the invitation, posted as an ordinary form (token in the body): works before the page's script has loaded. */
export async function acceptInvitationFormAction(_prev: ActionState, form: FormData | unknown): Promise<ActionState> {
  const token = formText(form, 'token');
  let next: string;
  try {
    const user = await requireActionUser();
    if (!token) throw badRequest('The invitation link is incomplete. Open it again from the e-mail.');
    const ws = await acceptInvitation({ token, userId: user.id, email: user.email });
    next = `/w/${ws.slug}`;
  } catch (err) {
    return toActionState(err);
  }
  redirect(next);
}
