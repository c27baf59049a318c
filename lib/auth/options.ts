import 'server-only';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import EmailProvider from 'next-auth/providers/email';
import { env, isHttpsApp } from '@/lib/env';
import { knexAdapter } from './adapter';
import { verifyPassword } from './password';
import { getCredentialsByEmail, getUserByEmail, getUserById, normaliseEmail } from '@/db/users';
import { createAuditEntry } from '@/db/audit';
import { assertSignInAllowed, limitEmailSend, recordSignInFailure, recordSignInSuccess, SignInLockedError } from './throttle';
import { sendMail } from '@/lib/mail/mailer';
import { signInLinkMail } from '@/lib/mail/templates';
import { signInSchema } from '@/lib/validation/auth';
import { log } from '@/lib/log';
import { AppError } from '@/lib/errors';

export const SIGN_IN_LINK_MINUTES = 10;

function clientIp(headers: Record<string, unknown> | Headers | undefined): string {
  const get = (n: string): string | undefined => {
    if (!headers) return undefined;
    if (headers instanceof Headers) return headers.get(n) ?? undefined;
    const v = headers[n];
    return typeof v === 'string' ? v : Array.isArray(v) ? String(v[0]) : undefined;
  };
  return (get('x-forwarded-for')?.split(',')[0] ?? get('x-real-ip') ?? '127.0.0.1').trim();
}

let cached: NextAuthOptions | undefined;

export function authOptions(): NextAuthOptions {
  if (cached) return cached;
  const e = env();
  cached = {
    secret: e.NEXTAUTH_SECRET,
    session: { strategy: 'jwt', maxAge: e.SESSION_MAX_HOURS * 3600, updateAge: 15 * 60 },
    useSecureCookies: isHttpsApp(),
    adapter: knexAdapter(),
    pages: { signIn: '/signin', verifyRequest: '/signin/check-email', error: '/signin' },
    logger: {
      error: (code, metadata) => log.error({ code, metadata: metadata instanceof Error ? metadata.message : undefined }, 'auth error'),
      warn: (code) => log.warn({ code }, 'auth warning'),
      debug: () => undefined,
    },
    providers: [
      CredentialsProvider({
        id: 'credentials',
        name: 'E-mail and password',
        credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
        async authorize(credentials, req) {
          const parsed = signInSchema.safeParse(credentials ?? {});
          if (!parsed.success) throw new Error('Enter your e-mail address and password.');
          const email = normaliseEmail(parsed.data.email);
          const ip = clientIp(req?.headers);
          try {
            await assertSignInAllowed(email, ip);
          } catch (err) {
            if (err instanceof SignInLockedError) {
              log.warn({ event: 'signin.locked', email, ip }, 'sign-in refused: locked');
              throw new Error(err.message);
            }
            throw err;
          }
          const found = await getCredentialsByEmail(email);
          const ok = await verifyPassword(found?.passwordHash ?? null, parsed.data.password);
          if (!found || !ok) {
            await recordSignInFailure(email, ip);
            log.warn({ event: 'signin.failed', email, ip }, 'sign-in failed');
            await createAuditEntry({ userId: found?.user.id ?? null, actor: email, action: 'signin.failed', ip });
            throw new Error('That e-mail and password do not match an account.');
          }
          await recordSignInSuccess(email);
          return { id: String(found.user.id), email: found.user.email, name: found.user.name };
        },
      }),
      EmailProvider({
        server: { host: e.SMTP_HOST, port: e.SMTP_PORT, secure: false, ignoreTLS: true },
        from: e.MAIL_FROM,
        maxAge: SIGN_IN_LINK_MINUTES * 60,
        async sendVerificationRequest({ identifier, url }) {
          const email = normaliseEmail(identifier);
          try {
            await limitEmailSend('signin', email);
          } catch (err) {
            if (err instanceof AppError) throw new Error(err.message);
            throw err;
          }
          // Unknown addresses get no mail, but the page says the same either way.
          if (!(await getUserByEmail(email))) return;
          await sendMail(signInLinkMail(email, url));
        },
      }),
    ],
    callbacks: {
      async signIn({ user, account, email }) {
        if (account?.provider === 'email') {
          if (email?.verificationRequest) return true;
          return !!(await getUserByEmail(String(user.email ?? '')));
        }
        return true;
      },
      async jwt({ token, user }) {
        if (user) {
          const u = await getUserById(Number(user.id));
          if (u) {
            token.uid = u.id;
            token.sv = u.sessionVersion;
            token.authAt = Date.now();
          }
        }
        return token;
      },
      async session({ session, token }) {
        if (session.user) (session.user as { id?: number }).id = Number(token.uid);
        return session;
      },
    },
    events: {
      async signIn({ user, account }) {
        const u = await getUserById(Number(user.id));
        log.info({ event: 'signin.ok', userId: u?.id, method: account?.provider }, 'signed in');
        await createAuditEntry({ userId: u?.id ?? null, actor: u?.email ?? null, action: 'signin', detail: { method: account?.provider ?? 'unknown' } });
      },
    },
  };
  return cached;
}
