import Link from 'next/link';

export const metadata = { title: 'Check your e-mail' };

export default function CheckEmailPage() {
  return (
    <>
      <h1 className="text-xl font-semibold">Check your e-mail</h1>
      <p className="mt-2 text-sm text-ink-soft">
        If the address belongs to a Tropopass account, a sign-in link is on its way. It works once, within 10 minutes.
      </p>
      <p className="mt-4 text-sm">
        <Link className="text-accent underline" href="/signin">
          Back to sign in
        </Link>
      </p>
    </>
  );
}
