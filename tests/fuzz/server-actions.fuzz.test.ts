import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import fc from 'fast-check';
import { makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import { resetScope } from '../support/request-scope';
import { serverActions } from '../integration/security/discover';
import { weirdScalar, weirdValue } from './arbitraries';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';

/**
 * Property: whatever a server action is handed (an array or object where an id belongs, unknown slugs,
 * huge strings, a FormData with repeated, missing or odd fields), it answers with its state or one of
 * the framework's own redirects and not-found signals; it never throws anything else and never answers
 * `internal` (what becomes a 500). The request is a signed-in owner posting from the app's own origin.
 */
vi.mock('next/headers', async () => (await import('../support/request-scope')).nextHeaders);
vi.mock('next/cache', () => ({
  revalidatePath: () => undefined,
  revalidateTag: () => undefined,
  refresh: () => undefined,
}));

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const a = s.address();
      s.close(() => resolve(typeof a === 'object' && a ? a.port : 0));
    });
  });
}

const smtpPort = await freePort();
const smtpHttpPort = await freePort();
useTestDatabase({
  RATE_LIMIT_API_PER_MIN: '1000000000',
  RATE_LIMIT_PREVIEW_PER_MIN: '1000000000',
  RATE_LIMIT_EMAIL_PER_HOUR: '1000000000',
  RATE_LIMIT_REPORT_SENDS_PER_HOUR: '1000000000',
  RATE_LIMIT_SIGNIN_PER_15MIN: '1000000000',
  SMTP_PORT: String(smtpPort),
  STRIPE_TIMEOUT_MS: '300',
  STRIPE_API_PORT: String(await freePort()),
});

// These end the caller's own sessions; they are fuzzed last so the rest run signed in.
const LAST = new Set(['signOutEverywhereAction']);

type Action = (...args: unknown[]) => Promise<unknown>;
const targets: { id: string; fn: Action }[] = [];
let smtp: SmtpFake;
let slug = '';
let ownerId = 0;
const figures: string[] = [];

beforeAll(async () => {
  smtp = await startSmtpFake({ smtpPort, httpPort: smtpHttpPort });
  const ws = await makeWorkspace(['planner', 'analyst', 'viewer', 'billing']);
  slug = ws.slug;
  ownerId = ws.owner.id;
  const { actions } = serverActions();
  for (const a of actions) {
    const mod = (await import(/* @vite-ignore */ path.join(process.cwd(), a.file))) as Record<string, unknown>;
    const fn = mod[a.name];
    if (typeof fn === 'function') targets.push({ id: `${a.file}#${a.name}`, fn: fn as Action });
  }
  targets.sort((x, y) => Number(LAST.has(x.id.split('#')[1])) - Number(LAST.has(y.id.split('#')[1])));
});

afterAll(async () => {
  await smtp?.close();
  console.info(`[fuzz] ${targets.length} server actions\n${figures.join('\n')}`);
});

const FORM_FIELDS = [
  'email',
  'password',
  'name',
  'workspaceName',
  'callbackUrl',
  'token',
  'confirm',
  'slug',
  'role',
  'id',
  'invitationToken',
];

function formArbitrary(): fc.Arbitrary<FormData> {
  const value = fc.oneof(
    weirdScalar.map((v) => String(v)),
    fc.constantFrom('//evil.example/', '/%09/evil.example', '%E0%A4%A', '/w/x?y=1', 'owner', 'viewer'),
  );
  return fc.array(fc.tuple(fc.constantFrom(...FORM_FIELDS), value, fc.boolean()), { maxLength: 8 }).map((entries) => {
    const f = new FormData();
    for (const [k, v, asFile] of entries) {
      if (asFile) f.append(k, new Blob([v]), 'x.txt');
      else f.append(k, v);
    }
    return f;
  });
}

function argsArbitrary(): fc.Arbitrary<unknown[]> {
  const slugArg = fc.oneof({ arbitrary: fc.constant('__SLUG__'), weight: 5 }, { arbitrary: weirdValue, weight: 1 });
  const positional = fc.tuple(slugArg, weirdValue, weirdValue).map((a) => a as unknown[]);
  const form = fc.tuple(fc.constant(null), formArbitrary()).map((a) => a as unknown[]);
  const idLike = fc
    .tuple(
      slugArg,
      fc.oneof(
        fc.array(fc.nat(), { maxLength: 3 }),
        fc.dictionary(fc.constantFrom('id', 'x'), weirdScalar),
        fc.record({ id: fc.oneof(fc.array(fc.nat()), fc.object(), weirdScalar) }),
      ),
    )
    .map((a) => a as unknown[]);
  return fc.oneof(positional, form, idLike);
}

function isFrameworkSignal(err: unknown): boolean {
  const digest = (err as { digest?: unknown } | null)?.digest;
  return (
    typeof digest === 'string' && (digest.startsWith('NEXT_REDIRECT') || digest.startsWith('NEXT_HTTP_ERROR_FALLBACK'))
  );
}

function runs(): number {
  const n = Number(process.env.FUZZ_RUNS);
  return Number.isFinite(n) && n > 0 ? Math.max(20, Math.floor(n / 50)) : 25;
}

describe('server actions under fuzzing', () => {
  it('every action answers with a state or a framework signal, never an internal error', async () => {
    expect(targets.length).toBeGreaterThan(20);
    const problems: string[] = [];
    for (const t of targets) {
      const started = Date.now();
      let cases = 0;
      await fc.assert(
        fc.asyncProperty(argsArbitrary(), async (raw) => {
          cases += 1;
          resetScope(await sessionCookie(ownerId));
          const args = raw.map((a) => (a === '__SLUG__' ? slug : a));
          let outcome: unknown;
          try {
            outcome = await t.fn(...args);
          } catch (err) {
            if (isFrameworkSignal(err)) return;
            problems.push(
              `${t.id} threw ${err instanceof Error ? `${err.name}: ${err.message}` : String(err)} for ${JSON.stringify(args).slice(0, 200)}`,
            );
            return;
          }
          if (outcome === null || outcome === undefined) return;
          const state = outcome as { ok?: unknown; error?: { code?: unknown } };
          if (typeof state.ok !== 'boolean') problems.push(`${t.id} answered ${JSON.stringify(outcome).slice(0, 120)}`);
          else if (state.ok === false && state.error?.code === 'internal')
            problems.push(`${t.id} internal error for ${JSON.stringify(args).slice(0, 200)}`);
        }),
        { numRuns: runs(), seed: 18 },
      );
      figures.push(
        `  ${t.id.padEnd(70)} ${String(cases).padStart(5)} cases ${((Date.now() - started) / 1000).toFixed(2)} s`,
      );
    }
    const perAction = new Map<string, string>();
    for (const p of problems) if (!perAction.has(p.split(' ')[0])) perAction.set(p.split(' ')[0], p.slice(0, 240));
    expect([...perAction.values()]).toEqual([]);
  }, 600_000);
});
