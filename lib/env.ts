import { z } from 'zod';

/**
 * The only reader of `process.env`. Parsed once, on first use; `instrumentation.ts` calls
 * `env()` at server start so a bad environment stops the server with a message naming the variable.
 */
const bool = z
  .enum(['0', '1', 'true', 'false', ''])
  .optional()
  .transform((v) => v === '1' || v === 'true');

const int = (fallback: number) => z.coerce.number().int().positive().default(fallback);

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  DATABASE_URL: z.string().optional(),
  SQLITE_FILE: z.string().default('.data/tropopass.sqlite'),
  NEXTAUTH_URL: z.string().url().default('http://127.0.0.1:3000'),
  NEXTAUTH_SECRET: z.string().min(16, 'NEXTAUTH_SECRET must be at least 16 characters'),
  SESSION_MAX_HOURS: int(12),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: int(2525),
  MAIL_FROM: z.string().default('Tropopass <no-reply@tropopass.test>'),
  MAIL_OUTBOX: bool,
  MAIL_FAKE_HTTP_URL: z.string().url().default('http://127.0.0.1:2580'),
  STRIPE_SECRET_KEY: z.string().default('sk_test_tropopass_local'),
  STRIPE_API_HOST: z.string().default('127.0.0.1'),
  STRIPE_API_PORT: int(12111),
  STRIPE_API_PROTOCOL: z.enum(['http', 'https']).default('http'),
  STRIPE_API_VERSION: z.string().default('2026-10-28.endive'),
  STRIPE_TIMEOUT_MS: int(8_000),
  STRIPE_WEBHOOK_SECRET: z.string().default('whsec_tropopass_local_fake'),
  RATE_LIMIT_SIGNIN_PER_15MIN: int(10),
  RATE_LIMIT_EMAIL_PER_HOUR: int(5),
  RATE_LIMIT_REPORT_SENDS_PER_HOUR: int(20),
  RATE_LIMIT_PREVIEW_PER_MIN: int(120),
  RATE_LIMIT_API_PER_MIN: int(600),
  BODY_LIMIT_BYTES: int(1_000_000),
  /** How many proxies of ours append to X-Forwarded-For in front of the app; 0 (default): the header is ignored. */
  TRUSTED_PROXY_HOPS: z.coerce.number().int().min(0).max(10).default(0),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  DEMO_TODAY: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/, 'DEMO_TODAY must be YYYY-MM-DD')
    .optional(),
  BILLING_SENDER: z
    .enum(['0', '1', 'true', 'false', ''])
    .optional()
    .transform((v) => v !== '0' && v !== 'false'),
  BILLING_SENDER_INTERVAL_MS: int(2_000),
  IMPORT_WORKER: z
    .enum(['0', '1', 'true', 'false', ''])
    .optional()
    .transform((v) => v !== '0' && v !== 'false'),
  /** Worker threads screening imported flights; unset: one core short of the machine (see lib/imports/screening-pool.ts). */
  SCREENING_THREADS: z.preprocess((v) => (v === '' ? undefined : v), z.coerce.number().int().min(0).max(64).optional()),
  /** Set by Next while it builds; background work does not start then. */
  NEXT_PHASE: z.string().optional(),
});

const DEFAULT_STRIPE_SECRET_KEY = 'sk_test_tropopass_local';
const DEFAULT_STRIPE_WEBHOOK_SECRET = 'whsec_tropopass_local_fake';

/** 127.0.0.0/8, ::1 and localhost: addresses no other machine can reach. */
export function isLoopbackHost(hostname: string): boolean {
  const h = hostname.replace(/^\[|\]$/g, '').toLowerCase();
  return h === 'localhost' || h === '::1' || /^127(\.\d{1,3}){3}$/.test(h);
}

/**
 * Settings that are safe only on one machine: the outbox page lists every sign-in, reset and invitation
 * link, and the payment defaults are public. Either is refused unless the app (for the outbox) or the
 * payment host (for the defaults) is a loopback address.
 */
const guardedSchema = envSchema.superRefine((e, ctx) => {
  let appHost = '';
  try {
    appHost = new URL(e.NEXTAUTH_URL).hostname;
  } catch {
    return;
  }
  if (e.MAIL_OUTBOX && !isLoopbackHost(appHost)) {
    ctx.addIssue({
      code: 'custom',
      path: ['MAIL_OUTBOX'],
      message: `MAIL_OUTBOX=1 shows every sign-in, reset and invitation link to anyone; it is allowed only when NEXTAUTH_URL is a loopback address (it is ${appHost})`,
    });
  }
  if (!isLoopbackHost(e.STRIPE_API_HOST)) {
    if (e.STRIPE_SECRET_KEY === DEFAULT_STRIPE_SECRET_KEY) {
      ctx.addIssue({
        code: 'custom',
        path: ['STRIPE_SECRET_KEY'],
        message:
          'the built-in key is public and works only with the local payment fake; set the real key for STRIPE_API_HOST',
      });
    }
    if (e.STRIPE_WEBHOOK_SECRET === DEFAULT_STRIPE_WEBHOOK_SECRET) {
      ctx.addIssue({
        code: 'custom',
        path: ['STRIPE_WEBHOOK_SECRET'],
        message: 'the built-in webhook secret is public; set the endpoint secret of your payment account',
      });
    }
  }
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

export function env(): Env {
  if (cached) return cached;
  const parsed = guardedSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.') || '(env)'}: ${i.message}`);
    throw new Error(`Tropopass cannot start: the environment is invalid.\n${lines.join('\n')}`);
  }
  cached = parsed.data;
  return cached;
}

/** Tests change the environment between files; this forgets the parsed copy. */
export function resetEnvForTests(): void {
  cached = undefined;
}

export function appUrl(): URL {
  return new URL(env().NEXTAUTH_URL);
}

export function isHttpsApp(): boolean {
  return appUrl().protocol === 'https:';
}
