import Link from 'next/link';
import { buttonClass } from './button';

/** Newer / older links of a keyset-paged list; either is left out when there is no such page. */
export function PagerLinks({ newerHref, olderHref }: { newerHref?: string | null; olderHref?: string | null }) {
  return (
    <div className="flex gap-2">
      {newerHref ? (
        <Link href={newerHref} className={buttonClass('secondary')}>
          Newer
        </Link>
      ) : null}
      {olderHref ? (
        <Link href={olderHref} className={buttonClass('secondary')}>
          Older
        </Link>
      ) : null}
    </div>
  );
}
