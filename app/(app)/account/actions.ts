'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { bumpSessionVersion, updateUserProfile } from '@/db/users';
import { createAuditEntry } from '@/db/audit';
import { noInput, userAction } from '@/lib/actions/workspace-action';

const unitsSchema = z.object({ units: z.enum(['metric', 'imperial'], { error: 'Pick metric or imperial.' }) });

export const updateUnitsAction = userAction(unitsSchema, async (user, { units }) => {
  await updateUserProfile(user.id, { units });
  revalidatePath('/', 'layout');
  return { message: 'Saved.' };
});

export const signOutEverywhereAction = userAction(noInput, async (user) => {
  await bumpSessionVersion(user.id);
  await createAuditEntry({ userId: user.id, actor: user.email, action: 'sessions.ended' });
});
