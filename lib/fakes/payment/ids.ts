import { randomBytes } from 'node:crypto';

const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

/** `prefix_` followed by 24 random base-62 characters, like the API's own ids. */
export function newId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let out = '';
  for (const byte of bytes) out += ALPHABET[byte % ALPHABET.length];
  return `${prefix}_${out}`;
}

/** Eight upper-case letters and digits, the shape of a customer's invoice number prefix. */
export function newInvoicePrefix(): string {
  const upper = ALPHABET.slice(0, 36);
  let out = '';
  for (const byte of randomBytes(8)) out += upper[byte % upper.length];
  return out;
}
