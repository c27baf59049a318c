'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { requireActionUser } from '@/lib/auth/guards';
import { bumpSessionVersion, updateUserProfile } from '@/db/users';
import { createAuditEntry } from '@/db/audit';
import { fromZod, toActionState, type ActionState } from '@/lib/errors';

const unitsSchema = z.object({ units: z.enum(['metric', 'imperial'], { error: 'Pick metric or imperial.' }) });

export async function updateUnitsAction(raw: unknown): Promise<ActionState> {
  try {
    const user = await requireActionUser();
    const parsed = unitsSchema.safeParse(raw);
    if (!parsed.success) throw fromZod(parsed.error);
    await updateUserProfile(user.id, { units: parsed.data.units });
    revalidatePath('/', 'layout');
    return { ok: true, message: 'Saved.' };
  } catch (err) {
    return toActionState(err);
  }
}

export async function signOutEverywhereAction(): Promise<ActionState> {
  try {
    const user = await requireActionUser();
    await bumpSessionVersion(user.id);
    await createAuditEntry({ userId: user.id, actor: user.email, action: 'sessions.ended' });
    return { ok: true };
  } catch (err) {
    return toActionState(err);
  }
}
