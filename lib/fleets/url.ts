/** The comparison's filters as they travel in the page URL and the API query string. */
export const COMPARE_FILTER_KEYS = [
  'from',
  'to',
  'aircraft',
  'route',
  'minFl',
  'maxFl',
  'groupBy',
  'fleets',
  'basis',
] as const;
export type CompareFilterKey = (typeof COMPARE_FILTER_KEYS)[number];

type ParamSource = { get(name: string): string | null } | Record<string, string | string[] | undefined>;

function read(src: ParamSource, key: string): string {
  if (typeof (src as { get?: unknown }).get === 'function')
    return ((src as { get(name: string): string | null }).get(key) ?? '').trim();
  const v = (src as Record<string, string | string[] | undefined>)[key];
  return (Array.isArray(v) ? (v[0] ?? '') : (v ?? '')).trim();
}

/** The filters present in the URL, in a fixed order, as the API's query string (empty values left out). */
export function compareQueryString(src: ParamSource): string {
  const out = new URLSearchParams();
  for (const k of COMPARE_FILTER_KEYS) {
    const v = read(src, k);
    if (v) out.set(k, v);
  }
  return out.toString();
}

/** The filters as a plain object for the schema (missing ones undefined). */
export function compareQueryObject(src: ParamSource): Partial<Record<CompareFilterKey, string>> {
  const out: Partial<Record<CompareFilterKey, string>> = {};
  for (const k of COMPARE_FILTER_KEYS) {
    const v = read(src, k);
    if (v) out[k] = v;
  }
  return out;
}
