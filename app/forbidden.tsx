import Link from 'next/link';

export default function Forbidden() {
  return (
    <main id="main" className="mx-auto max-w-xl px-6 py-24 text-center">
      <h1 className="text-2xl font-semibold">Not part of your role</h1>
      <p className="mt-2 text-ink-soft">
        Your role in this workspace does not include this page. A workspace owner can change your role.
      </p>
      <Link href="/workspaces" className="mt-6 inline-block text-accent underline">
        Your workspaces
      </Link>
    </main>
  );
}
