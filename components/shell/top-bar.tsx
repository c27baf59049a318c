import Link from 'next/link';
import type { SessionUser } from '@/lib/auth/session';
import { UserMenu } from './user-menu';

export function TopBar({ user, children }: { user: SessionUser; children?: React.ReactNode }) {
  return (
    <header className="border-b border-line bg-paper-raised">
      <div className="mx-auto flex h-14 max-w-[1400px] items-center gap-4 px-4">
        <Link href="/workspaces" className="text-base font-semibold tracking-tight">
          Tropo<span className="text-strato">pass</span>
        </Link>
        <div className="flex-1">{children}</div>
        <UserMenu email={user.email} name={user.name} />
      </div>
    </header>
  );
}
