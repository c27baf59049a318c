import { TEST_ORIGIN } from '../../support/test-db';

/** A real multipart/form-data Request with a CSV file in `file` (or a field named otherwise) and text fields. */
export function multipartRequest(
  pathname: string,
  opts: {
    cookie?: string;
    csv: string | Uint8Array<ArrayBuffer>;
    fileName?: string;
    field?: string;
    fields?: Record<string, string>;
  },
): Request {
  const form = new FormData();
  const bytes = typeof opts.csv === 'string' ? new TextEncoder().encode(opts.csv) : opts.csv;
  form.set(opts.field ?? 'file', new Blob([bytes], { type: 'text/csv' }), opts.fileName ?? 'upload.csv');
  for (const [k, v] of Object.entries(opts.fields ?? {})) form.set(k, v);
  const headers = new Headers();
  if (opts.cookie) headers.set('cookie', opts.cookie);
  headers.set('host', new URL(TEST_ORIGIN).host);
  return new Request(new URL(pathname, TEST_ORIGIN), { method: 'POST', headers, body: form });
}
