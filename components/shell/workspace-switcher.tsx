'use client';

import { usePathname, useRouter } from 'next/navigation';
import { ROLE_LABELS, type Role } from '@/lib/auth/policy';
import { switchWorkspacePath } from './switch-path';

export function WorkspaceSwitcher({
  current,
  options,
}: {
  current: string;
  options: { slug: string; name: string; role: Role }[];
}) {
  const router = useRouter();
  const pathname = usePathname();
  return (
    <label className="flex min-w-0 items-center gap-2 text-sm">
      <span className="sr-only">Workspace</span>
      <select
        value={current}
        onChange={(e) => {
          const to = options.find((o) => o.slug === e.target.value);
          router.push(to ? switchWorkspacePath(pathname, to.slug, to.role) : '/workspaces');
        }}
        className="w-full min-w-0 max-w-xs truncate rounded-md border border-line-strong bg-paper-raised px-2 py-1.5 text-sm sm:w-auto"
      >
        {options.map((o) => (
          <option key={o.slug} value={o.slug}>
            {o.name} — {ROLE_LABELS[o.role]}
          </option>
        ))}
        <option value="__all">All workspaces…</option>
      </select>
    </label>
  );
}
