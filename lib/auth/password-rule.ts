import { dictionary } from '@zxcvbn-ts/language-common';
import { DEMO_PASSWORD, DEMO_USERS } from '@/seeds/01_demo_accounts';

/**
 * What a new password must not be, after the length rule of the schema. The checks follow NIST SP 800-63B
 * (rev. 3, section 5.1.1.2, "memorized secret verifiers"): refuse values from lists of commonly used or
 * breached passwords, repetitive or sequential characters, and context-specific words such as the name
 * of the service or the username. The common list is the password dictionary that ships with
 * @zxcvbn-ts/language-common (about 49 000 entries), read from disk, never fetched.
 */
const COMMON = new Set(dictionary['passwords-common'].map((p) => p.toLowerCase()));

const PRODUCT_NAMES = ['tropopass'];

const SEQUENCES = [
  'abcdefghijklmnopqrstuvwxyz',
  '01234567890',
  'qwertyuiop',
  'asdfghjkl',
  'zxcvbnm',
  'qwertzuiop',
  'azertyuiop',
  '1qaz2wsx3edc4rfv5tgb6yhn7ujm8ik9ol0p',
];

const DEMO_EMAILS: ReadonlySet<string> = new Set(DEMO_USERS.map((u) => u.email));

export interface PasswordContext {
  email: string;
  name?: string;
}

/** Why the password is refused, as a sentence for the password field; null when it is acceptable. */
export function passwordProblem(password: string, ctx: PasswordContext): string | null {
  const lower = password.toLowerCase();
  const email = ctx.email.trim().toLowerCase();
  if (password === DEMO_PASSWORD && DEMO_EMAILS.has(email)) return null;

  if (COMMON.has(lower) || COMMON.has(stripDecoration(lower))) {
    return 'This password is on a list of commonly used passwords. Choose one that is not.';
  }
  if (isRepetitive(lower)) return 'This password repeats the same few characters. Choose one that does not.';
  if (isSequential(lower))
    return 'This password is mostly a sequence (like 12345 or abcde or qwerty). Choose one that is not.';
  if (PRODUCT_NAMES.some((n) => lower.includes(n)))
    return "This password contains the product's name. Choose one that does not.";
  const personal = personalWords(email, ctx.name);
  if (personal.some((w) => lower.includes(w)))
    return 'This password contains your name or e-mail address. Choose one that does not.';
  return null;
}

/** `Password12!` -> `password`: a common word with a few digits or symbols added is still common. */
function stripDecoration(lower: string): string {
  const core = lower.replace(/^[\d\W_]{1,4}/, '').replace(/[\d\W_]{1,4}$/, '');
  return core.length >= 4 ? core : lower;
}

function isRepetitive(lower: string): boolean {
  const chars = [...lower];
  if (new Set(chars).size < 4) return true;
  // The whole password is one short piece said again and again ("abcabcabcabc").
  for (let size = 1; size <= chars.length / 2; size++) {
    if (chars.length % size !== 0) continue;
    const unit = chars.slice(0, size).join('');
    if (unit.repeat(chars.length / size) === lower) return true;
  }
  return false;
}

function isSequential(lower: string): boolean {
  const chars = [...lower];
  let covered = 0;
  let i = 0;
  while (i < chars.length) {
    let best = 1;
    for (const seq of SEQUENCES) {
      for (const s of [seq, [...seq].reverse().join('')]) {
        let len = 0;
        while (i + len < chars.length && s.includes(chars.slice(i, i + len + 1).join(''))) len += 1;
        best = Math.max(best, len);
      }
    }
    if (best >= 4) covered += best;
    i += best;
  }
  return covered * 2 > chars.length;
}

function personalWords(email: string, name?: string): string[] {
  const local = email.split('@')[0] ?? '';
  const words = [local, ...local.split(/[._+\-]+/), ...(name ?? '').toLowerCase().split(/[\s._'\-]+/)];
  return [...new Set(words.filter((w) => w.length >= 3))];
}
