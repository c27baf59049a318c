import 'server-only';
import { hash, verify } from '@node-rs/argon2';

/** argon2id with the library's defaults (m = 19456 KiB, t = 2, p = 1). */
export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

// A fixed hash to verify against when the account does not exist, so timing does not reveal it.
const DUMMY_HASH = '$argon2id$v=19$m=19456,t=2,p=1$+b7w9yMhOPrZfz6+LZi5BQ$6tsWkIfIPcy2WK7PCGqWpuWpYTHdSO781RcgffCCV+4';

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
  try {
    const ok = await verify(passwordHash ?? DUMMY_HASH, password);
    return ok && passwordHash !== null;
  } catch {
    return false;
  }
}
