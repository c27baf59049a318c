import type { LineProblem } from '@/lib/validation/problems';

export interface UploadOutcome<T> {
  ok: boolean;
  status: number;
  body: T | null;
  message: string;
  problems: LineProblem[];
  warnings: LineProblem[];
  fields: { path: string; message: string }[];
}

/** Posts a multipart form to the API and reads the answer in the shapes our import handlers use. */
export async function postUpload<T>(url: string, form: FormData): Promise<UploadOutcome<T>> {
  let res: Response;
  try {
    res = await fetch(url, { method: 'POST', body: form, credentials: 'same-origin' });
  } catch {
    return {
      ok: false,
      status: 0,
      body: null,
      message: 'The upload did not reach the server. Check your connection and try again.',
      problems: [],
      warnings: [],
      fields: [],
    };
  }
  const data = (await res.json().catch(() => null)) as
    (Record<string, unknown> & { error?: { message?: string; fields?: { path: string; message: string }[] } }) | null;
  const list = (v: unknown): LineProblem[] => (Array.isArray(v) ? (v as LineProblem[]) : []);
  return {
    ok: res.ok,
    status: res.status,
    body: res.ok ? (data as T) : null,
    message: res.ok ? '' : (data?.error?.message ?? `The upload failed (${res.status}).`),
    problems: list(data?.problems),
    warnings: list(data?.warnings),
    fields: data?.error?.fields ?? [],
  };
}
