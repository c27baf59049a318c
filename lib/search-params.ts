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
