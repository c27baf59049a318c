/** The screening endpoints' error answers as the form reads them, and the save's idempotency key. */
export class ApiProblem extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly fields: { path: string; message: string }[],
  ) {
    super(message);
  }
}

export async function readProblem(res: Response): Promise<ApiProblem> {
  const body = (await res.json().catch(() => null)) as {
    error?: { message?: string; fields?: { path: string; message: string }[] };
  } | null;
  const fields = body?.error?.fields ?? [];
  let message = body?.error?.message ?? 'The screening service did not answer. Try again in a moment.';
  if (res.status === 429) message = 'Too many previews in a short time; the preview resumes in a moment.';
  if (res.status === 401) message = 'Your session has ended. Sign in again to continue.';
  return new ApiProblem(message, res.status, fields);
}

export function newIdempotencyKey(): string {
  if (typeof crypto !== 'undefined' && typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  return `save-${Date.now().toString(36)}-${Math.random().toString(36).slice(2)}`;
}
