'use client';

import { useSearchParams } from 'next/navigation';
import { Notice } from '@/components/ui/notice';
import { OUTSIDE_ROLE_NOTICE } from '@/lib/auth/landing';
import { ROLE_LABELS, type Role } from '@/lib/auth/policy';

/** The one-line reason a sign-in landed here instead of on the link that was followed. */
export function RoleNotice({ role }: { role: Role }) {
  const params = useSearchParams();
  if (params.get('notice') !== OUTSIDE_ROLE_NOTICE) return null;
  return (
    <div className="mb-4">
      <Notice tone="info" role="status">
        The page you followed is not part of your role ({ROLE_LABELS[role]}), so you start here.
      </Notice>
    </div>
  );
}
