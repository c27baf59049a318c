'use client';

import { useRouter } from 'next/navigation';
import { ROLE_LABELS, type Role } from '@/lib/auth/policy';

export function WorkspaceSwitcher({ current, options }: { current: string; options: { slug: string; name: string; role: Role }[] }) {
  const router = useRouter();
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="sr-only">Workspace</span>
      <select
        value={current}
        onChange={(e) => router.push(e.target.value === '__all' ? '/workspaces' : `/w/${e.target.value}`)}
        className="rounded-md border border-line-strong bg-paper-raised px-2 py-1.5 text-sm"
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
