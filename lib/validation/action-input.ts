import { z } from 'zod';
import { badRequest } from '@/lib/errors';

/**
 * What a server action receives is whatever the client sent, not what its TypeScript signature says:
 * an id may arrive as an array or an object, and a form action may be called with no FormData at all.
 */
const actionIdSchema = z.union([
  z.number().int().positive().max(2_147_483_647),
  z
    .string()
    .regex(/^\d{1,10}$/)
    .transform(Number)
    .pipe(z.number().int().positive().max(2_147_483_647)),
]);

/** The id argument of an action as a positive integer, or a 400 naming the field. */
export function actionId(raw: unknown): number {
  const parsed = actionIdSchema.safeParse(raw);
  if (!parsed.success)
    throw badRequest('That item id is not valid.', [{ path: 'id', message: 'Choose an item from the list.' }]);
  return parsed.data;
}

/** An optional id (null for "new"), with the same check. */
export function optionalActionId(raw: unknown): number | null {
  return raw === null || raw === undefined ? null : actionId(raw);
}

/** A posted form's single text field; absent when the form is missing, the field repeats or is a file. */
export function formText(form: unknown, name: string): string | undefined {
  if (!(form instanceof FormData)) return undefined;
  const all = form.getAll(name);
  return all.length === 1 && typeof all[0] === 'string' ? all[0] : undefined;
}
