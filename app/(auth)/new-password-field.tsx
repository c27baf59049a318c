import { Field, TextInput } from '@/components/ui/field';

/** A new password, with the rule it must meet (checked on the server by `password-rule.ts`). */
export function NewPasswordField({ label, error }: { label: string; error: string | undefined }) {
  return (
    <Field
      id="password"
      label={label}
      hint="At least 10 characters; not a common password, a run like 12345, or your name."
      error={error}
    >
      <TextInput id="password" name="password" type="password" autoComplete="new-password" required invalid={!!error} />
    </Field>
  );
}
