'use client';

import Link from 'next/link';
import { signOut } from 'next-auth/react';

export function UserMenu({ email, name }: { email: string; name: string }) {
  return (
    <details className="relative min-w-0 shrink">
      <summary className="block max-w-[9rem] cursor-pointer list-none truncate rounded-md px-2 py-1 text-sm text-ink-soft hover:bg-paper-sunk sm:max-w-[16rem]">
        {name || email}
        <span className="sr-only"> (account menu)</span>
      </summary>
      <div className="absolute right-0 z-40 mt-1 w-56 max-w-[calc(100vw-2rem)] rounded-md border border-line bg-paper-raised p-1 text-sm shadow-lg">
        <p className="truncate px-3 py-2 text-xs text-ink-faint">{email}</p>
        <Link href="/account" className="block rounded px-3 py-2 hover:bg-paper-sunk">
          Account and units
        </Link>
        <Link href="/workspaces" className="block rounded px-3 py-2 hover:bg-paper-sunk">
          All workspaces
        </Link>
        <button
          type="button"
          onClick={() => signOut({ callbackUrl: '/signin' })}
          className="block w-full rounded px-3 py-2 text-left hover:bg-paper-sunk"
        >
          Sign out
        </button>
      </div>
    </details>
  );
}
