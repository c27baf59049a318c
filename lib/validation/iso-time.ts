const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function digits(s: string, from: number, count: number): number {
  let v = 0;
  for (let i = from; i < from + count; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

/**
 * Milliseconds since 1970 of an ISO 8601 UTC time, the same value as `Date.parse`: the common
 * `YYYY-MM-DDTHH:MM:SSZ` and `YYYY-MM-DDTHH:MM:SS.sssZ` forms are read directly (a flown track has
 * thousands of them, and `Date.parse` dominated its reading); anything else goes to `Date.parse`.
 * NaN when the text is not a time. Client-safe.
 */
export function isoTimeMs(s: string): number {
  const n = s.length;
  if ((n === 20 || n === 24) && s.charCodeAt(n - 1) === 90 /* Z */ && s[4] === '-' && s[7] === '-') {
    if (s[10] === 'T' && s[13] === ':' && s[16] === ':' && (n === 20 || s[19] === '.')) {
      const y = digits(s, 0, 4);
      const mo = digits(s, 5, 2);
      const d = digits(s, 8, 2);
      const h = digits(s, 11, 2);
      const mi = digits(s, 14, 2);
      const se = digits(s, 17, 2);
      const ms = n === 24 ? digits(s, 20, 3) : 0;
      const leap = y % 4 === 0 && (y % 100 !== 0 || y % 400 === 0);
      const dim = mo >= 1 && mo <= 12 ? DAYS_IN_MONTH[mo - 1] + (mo === 2 && leap ? 1 : 0) : 0;
      if (y >= 0 && d >= 1 && d <= dim && h >= 0 && h <= 23 && mi >= 0 && mi <= 59 && se >= 0 && se <= 59 && ms >= 0)
        return Date.UTC(y, mo - 1, d, h, mi, se, ms);
    }
  }
  return Date.parse(s);
}
