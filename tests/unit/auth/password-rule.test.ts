import { describe, expect, it } from 'vitest';
import { passwordProblem } from '@/lib/auth/password-rule';

const ctx = { email: 'mira.holt@operator.example', name: 'Mira Holt' };

describe('password rule (NIST SP 800-63B rev. 3, 5.1.1.2)', () => {
  it.each([
    ['aaaaaaaaaa', /repeats/],
    ['abababababab', /repeats/],
    ['password12', /commonly used/],
    ['Password2026!', /commonly used/],
    ['1234567890', /commonly used|sequence/],
    ['abcdefghijkl', /sequence/],
    ['98765432109', /sequence|commonly/],
    ['qwertyuiop12', /sequence|commonly/],
    ['zx9abcdefgh', /sequence/],
    ['my tropopass key', /product/],
    ['TropoPass!x7Q', /product/],
    ['mira-flies-north', /your name/],
    ['hangar7holt!', /your name/],
  ])('refuses %s', (pw, why) => {
    expect(passwordProblem(pw, ctx)).toMatch(why);
  });

  it.each(['correct horse battery', 'stratus-lantern-41', 'Kx7#mQ2pL9wz'])('accepts %s', (pw) => {
    expect(passwordProblem(pw, ctx)).toBeNull();
  });

  it('the demo password is allowed only for the seeded demo accounts', () => {
    expect(passwordProblem('tropopass-demo', { email: 'planner@tropopass.test' })).toBeNull();
    expect(passwordProblem('tropopass-demo', { email: 'someone@operator.example' })).toMatch(/product/);
  });
});
