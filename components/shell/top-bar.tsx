import Link from 'next/link';
import type { SessionUser } from '@/lib/auth/session';
import { UserMenu } from './user-menu';

/**
 * The header. `menu` is the small-screen navigation (shown below the `md` breakpoint, where the
 * sidebar is hidden); `children` (the workspace switcher) sits in the header from `sm` up and inside
 * that menu below it.
 */
export function TopBar({
  user,
  menu,
  children,
}: {
  user: SessionUser;
  menu?: React.ReactNode;
  children?: React.ReactNode;
}) {
  return (
    <header className="relative border-b border-line bg-paper-raised">
      <div className="mx-auto flex h-14 max-w-[1400px] items-center gap-2 px-4 sm:gap-4">
        {menu}
        <Link href="/workspaces" className="shrink-0 text-base font-semibold tracking-tight">
          Tropo<span className="text-strato">pass</span>
        </Link>
        <div className={`min-w-0 flex-1 ${menu ? 'hidden sm:block' : ''}`}>{children}</div>
        {menu ? <div className="flex-1 sm:hidden" /> : null}
        <UserMenu email={user.email} name={user.name} />
      </div>
    </header>
  );
}
