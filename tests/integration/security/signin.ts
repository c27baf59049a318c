import { authOptions } from '@/lib/auth/options';

type Authorize = (
  credentials: Record<string, string> | undefined,
  req: { headers: Record<string, string> },
) => Promise<unknown>;

/** The credentials provider's own authorize(), exactly as next-auth calls it on POST /api/auth/callback/credentials. */
export async function attemptSignIn(
  email: string,
  password: string,
  ip = '127.0.0.1',
): Promise<{ ok: true } | { ok: false; message: string }> {
  const provider = authOptions().providers.find((p) => p.id === 'credentials') as unknown as {
    options: { authorize: Authorize };
  };
  try {
    const user = await provider.options.authorize({ email, password }, { headers: { 'x-forwarded-for': ip } });
    return user ? { ok: true } : { ok: false, message: '(no user)' };
  } catch (err) {
    return { ok: false, message: err instanceof Error ? err.message : String(err) };
  }
}

/** Forgets the in-process limiters, as a restart of the server would. */
export function forgetLimiters(): void {
  delete (globalThis as { tropopassLimiters?: unknown }).tropopassLimiters;
}
