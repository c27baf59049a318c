import type { Metadata } from 'next';
import Link from 'next/link';
import { redirect } from 'next/navigation';
import { SignInForm } from './sign-in-form';
import { currentUser } from '@/lib/auth/session';
import { DEFAULT_LANDING, safeCallbackPath } from '@/lib/auth/callback';
import { appUrl } from '@/lib/env';

export const metadata: Metadata = { title: 'Sign in' };

const ERRORS: Record<string, string> = {
  Verification: 'That sign-in link has expired or was already used. Ask for a new one.',
  AccessDenied: 'That address has no Tropopass account. Sign up first or ask your workspace owner for an invitation.',
  EmailSignin: 'The sign-in link could not be sent. Try again in a moment.',
};

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const sp = await searchParams;
  const first = (v: string | string[] | undefined) => (typeof v === 'string' ? v : undefined);
  const callbackUrl = safeCallbackPath(first(sp.callbackUrl), appUrl()) ?? DEFAULT_LANDING;
  // Someone already signed in has nothing to do here: on to the link they followed, or their landing.
  if (await currentUser())
    redirect(callbackUrl === DEFAULT_LANDING ? DEFAULT_LANDING : `/start?next=${encodeURIComponent(callbackUrl)}`);
  const error = first(sp.error);
  const notice = error
    ? (ERRORS[error] ?? 'Sign-in did not work. Try again.')
    : first(sp.reset) === '1'
      ? 'Your password was changed. Sign in with the new one.'
      : undefined;
  return (
    <>
      <h1 className="text-xl font-semibold">Sign in</h1>
      <p className="mt-1 text-sm text-ink-soft">
        New here?{' '}
        <Link className="text-accent underline" href="/signup">
          Create an account
        </Link>
      </p>
      <SignInForm callbackUrl={callbackUrl} initialNotice={notice} />
    </>
  );
}
