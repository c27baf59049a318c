import Link from 'next/link';

export const metadata = { title: 'Check your e-mail' };

/** The one answer to every sign-up without an invitation, whether or not the address already had an account. */
export default function SignUpCheckEmailPage() {
  return (
    <>
      <h1 className="text-xl font-semibold">Check your e-mail</h1>
      <p className="mt-2 text-sm text-ink-soft">
        We sent a message to the address you gave. Follow its link within 60 minutes to confirm the address and sign in.
        If the address already had an account, the message says how to sign in instead.
      </p>
      <p className="mt-4 text-sm">
        <Link className="text-accent underline" href="/signin">
          Back to sign in
        </Link>
      </p>
    </>
  );
}
