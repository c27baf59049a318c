/** A page's search parameters as the framework hands them over. */
export type SearchParams = Record<string, string | string[] | undefined>;

/** The props of a workspace list page whose filters live in its URL. */
export interface ListPageProps {
  params: Promise<{ slug: string }>;
  searchParams: Promise<SearchParams>;
}

/** The first value of a search parameter, trimmed; '' when there is none. */
export const firstParam = (v: string | string[] | undefined): string =>
  (Array.isArray(v) ? (v[0] ?? '') : (v ?? '')).trim();

/** A filter's date range: an end before the start is named on `to` and left out of the filters. */
export function checkDateOrder(filters: { from?: string; to?: string }, problems: { to?: string }): void {
  if (filters.from && filters.to && filters.from > filters.to) {
    problems.to = 'The end date is before the start date.';
    delete filters.to;
  }
}

/**
 * The links of a list paged by cursor: `href(patch)` keeps the page's own parameters (`kept`, in
 * order) and sets or, for an empty value, drops what `patch` names; `olderHref` follows `nextCursor`
 * and pushes the current cursor ('0' on the first page) on the trail; `newerHref` goes back by the
 * trail. Null where there is no such page.
 */
export function cursorPageLinks(
  path: string,
  kept: Record<string, string | undefined>,
  paging: { cursor: string | undefined; nextCursor: string | null | undefined; trail: string[] },
): { href: (patch: Record<string, string | undefined>) => string; olderHref: string | null; newerHref: string | null } {
  const href = (patch: Record<string, string | undefined>) => {
    const q = new URLSearchParams();
    for (const [k, v] of Object.entries(kept)) if (v) q.set(k, v);
    for (const [k, v] of Object.entries(patch)) {
      if (v) q.set(k, v);
      else q.delete(k);
    }
    const qs = q.toString();
    return `${path}${qs ? `?${qs}` : ''}`;
  };
  const { cursor, nextCursor, trail } = paging;
  const olderHref = nextCursor ? href({ cursor: nextCursor, trail: [...trail, cursor ?? '0'].join(',') }) : null;
  const previous = trail.length ? trail[trail.length - 1] : null;
  const newerHref = cursor
    ? href({
        cursor: previous && previous !== '0' ? previous : undefined,
        trail: trail.slice(0, -1).join(',') || undefined,
      })
    : null;
  return { href, olderHref, newerHref };
}
