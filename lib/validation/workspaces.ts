import { z } from 'zod';
import { API_KEY_ROLES, ROLES } from '@/lib/auth/policy';
import { hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE } from './display-text';

export const workspaceCreateSchema = z.object({
  name: z
    .string({ error: 'Enter a name.' })
    .trim()
    .min(2, 'Use at least 2 characters.')
    .max(120, 'Use at most 120 characters.')
    .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE),
  slug: z
    .string()
    .trim()
    .toLowerCase()
    .regex(
      /^[a-z0-9](?:[a-z0-9-]{0,46}[a-z0-9])?$/,
      'Use lower-case letters, digits and dashes (2-48), not starting or ending with a dash.',
    )
    .optional()
    .or(z.literal('').transform(() => undefined)),
});
export type WorkspaceCreateInput = z.infer<typeof workspaceCreateSchema>;

export const invitationCreateSchema = z.object({
  email: z.string().trim().email('Enter a valid e-mail address.').max(254),
  role: z.enum(ROLES, { error: 'Pick a role.' }),
});

export const memberRoleSchema = z.object({
  userId: z.coerce.number().int().positive(),
  role: z.enum(ROLES, { error: 'Pick a role.' }),
});

export const apiKeyCreateSchema = z.object({
  name: z
    .string({ error: 'Name the key.' })
    .trim()
    .min(1, 'Name the key.')
    .max(80, 'Use at most 80 characters.')
    .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE),
  role: z.enum(API_KEY_ROLES, { error: 'A key can be planner, analyst or viewer.' }).default('planner'),
});
export type ApiKeyCreateInput = z.infer<typeof apiKeyCreateSchema>;
