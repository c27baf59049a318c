import Link from 'next/link';
import { buttonClass } from './button';

/** The Filter button of a GET filter form, and a Clear link back to the unfiltered list when anything is set. */
export function FilterActions({
  clearHref,
  showClear,
  className,
}: {
  clearHref: string;
  showClear: boolean;
  className: string;
}) {
  return (
    <div className={`flex gap-2 ${className}`}>
      <button type="submit" className={buttonClass('secondary')}>
        Filter
      </button>
      {showClear ? (
        <Link href={clearHref} className={buttonClass('ghost')}>
          Clear
        </Link>
      ) : null}
    </div>
  );
}
