import Link from 'next/link';

export default function NotFound() {
  return (
    <main id="main" className="mx-auto max-w-xl px-6 py-24 text-center">
      <h1 className="text-2xl font-semibold">Not found</h1>
      <p className="mt-2 text-ink-soft">
        This page does not exist, or it belongs to a workspace you are not a member of.
      </p>
      <Link href="/workspaces" className="mt-6 inline-block text-accent underline">
        Your workspaces
      </Link>
    </main>
  );
}
