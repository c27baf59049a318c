/**
 * The one test for where the browser may be sent after sign-in: a path on this app, never another site.
 * The value is parsed against the app's own URL and its origin compared, so every trick a browser
 * reads as "another host" (`//host`, `/\host`, tabs or newlines inside, encoded slashes that a later
 * decode would turn into one of those) is refused. Used by the sign-in page and form, proxy.ts and
 * next-auth's redirect callback. No server-only imports: the form runs in the browser too.
 */
export const DEFAULT_LANDING = '/start';

/** Set by proxy.ts on every page request (overwriting any sent by the client): the path and query asked for. */
export const RETURN_TO_HEADER = 'x-tropopass-return-to';

/** Set by proxy.ts to "1" on a full page load (not a client navigation or a server action): the only kind whose status code a browser sees. */
export const DOCUMENT_HEADER = 'x-tropopass-document';

const MAX_CALLBACK_LENGTH = 2048;

function looksLikeHostStart(path: string): boolean {
  return /^[/\\]{2}/.test(path) || /^\/[\\]/.test(path);
}

export function safeCallbackPath(raw: string | null | undefined, appOrigin: string | URL): string | null {
  if (typeof raw !== 'string' || raw.length === 0 || raw.length > MAX_CALLBACK_LENGTH) return null;
  // Control characters are stripped by URL parsers; a value carrying any is refused outright.
  if (/[\u0000-\u001f\u007f\\]/.test(raw)) return null;
  let base: URL;
  try {
    base = new URL(String(appOrigin));
  } catch {
    return null;
  }
  let url: URL;
  try {
    url = new URL(raw, base.origin);
  } catch {
    return null;
  }
  if (url.origin !== base.origin) return null;
  if (url.username || url.password) return null;
  const path = `${url.pathname}${url.search}${url.hash}`;
  if (!path.startsWith('/') || looksLikeHostStart(path)) return null;
  // A later decode (a framework, a proxy, a mail client) must not turn the path into another host.
  let decoded = path;
  for (let i = 0; i < 3; i++) {
    let next: string;
    try {
      next = decodeURIComponent(decoded);
    } catch {
      return null;
    }
    if (/[\u0000-\u001f\u007f\\]/.test(next) || looksLikeHostStart(next)) return null;
    if (next === decoded) break;
    decoded = next;
  }
  return path;
}

/** The callback if it is safe, else the default landing. */
export function callbackOrDefault(
  raw: string | null | undefined,
  appOrigin: string | URL,
  fallback = DEFAULT_LANDING,
): string {
  return safeCallbackPath(raw, appOrigin) ?? fallback;
}
