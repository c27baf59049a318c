import { z } from 'zod';
import { hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE } from './display-text';

const email = z
  .string({ error: 'Enter your e-mail address.' })
  .trim()
  .min(1, 'Enter your e-mail address.')
  .max(254, 'That address is too long.')
  .email('Enter a valid e-mail address, like name@airline.example.');

const newPassword = z
  .string({ error: 'Choose a password.' })
  .min(10, 'Use at least 10 characters.')
  .max(200, 'Use at most 200 characters.');

export const signInSchema = z.object({
  email,
  password: z
    .string({ error: 'Enter your password.' })
    .min(1, 'Enter your password.')
    .max(200, 'That password is too long.'),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: z
    .string({ error: 'Enter your name.' })
    .trim()
    .min(1, 'Enter your name.')
    .max(120, 'Use at most 120 characters.')
    .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE),
  email,
  password: newPassword,
  workspaceName: z
    .string()
    .trim()
    .max(120, 'Use at most 120 characters.')
    .refine(hasNoHiddenCharacters, HIDDEN_CHARACTERS_MESSAGE)
    .optional()
    .transform((v) => (v ? v : undefined)),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const emailOnlySchema = z.object({ email });

export const resetPasswordSchema = z
  .object({ token: z.string().min(10, 'This reset link is not valid.'), password: newPassword, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
