import { NewPasswordForm } from '../reset-forms';

export const metadata = { title: 'Choose a new password' };

export default async function NewPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <>
      <h1 className="text-xl font-semibold">Choose a new password</h1>
      <p className="mt-1 text-sm text-ink-soft">Every device signed in to this account will be signed out.</p>
      <NewPasswordForm token={token} />
    </>
  );
}
