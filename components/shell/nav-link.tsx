'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';

export function NavLink({ href, exact, children }: { href: string; exact?: boolean; children: React.ReactNode }) {
  const path = usePathname();
  const active = exact ? path === href : path === href || path.startsWith(`${href}/`);
  return (
    <Link
      href={href}
      aria-current={active ? 'page' : undefined}
      className={`block rounded-md px-3 py-1.5 text-sm ${active ? 'bg-accent-soft font-medium text-accent-strong' : 'text-ink-soft hover:bg-paper-sunk hover:text-ink'}`}
    >
      {children}
    </Link>
  );
}
