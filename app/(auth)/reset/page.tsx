import { RequestResetForm } from './reset-forms';

export const metadata = { title: 'Reset password' };

export default function ResetPage() {
  return (
    <>
      <h1 className="text-xl font-semibold">Reset your password</h1>
      <p className="mt-1 text-sm text-ink-soft">
        Enter your account&apos;s e-mail; we send a link to choose a new password.
      </p>
      <RequestResetForm />
    </>
  );
}
