import 'server-only';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import EmailProvider from 'next-auth/providers/email';
import { env, isHttpsApp } from '@/lib/env';
import { knexAdapter } from './adapter';
import { getUserByEmail, getUserById, normaliseEmail } from '@/db/users';
import { createAuditEntry } from '@/db/audit';
import { revokeSession } from '@/db/sessions';
import { limitEmailSend } from './throttle';
import { checkCredentials, sessionClaims } from './credentials';
import { clientIpFrom } from './client-ip';
import { DEFAULT_LANDING, safeCallbackPath } from './callback';
import { sendMail } from '@/lib/mail/mailer';
import { signInLinkMail } from '@/lib/mail/templates';
import { signInSchema } from '@/lib/validation/auth';
import { log } from '@/lib/log';
import { AppError } from '@/lib/errors';

export const SIGN_IN_LINK_MINUTES = 10;

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
      error: (code, metadata) =>
        log.error({ code, metadata: metadata instanceof Error ? metadata.message : undefined }, 'auth error'),
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
          const headers = req?.headers as Record<string, unknown> | undefined;
          const ip = clientIpFrom((n) => {
            const v = headers?.[n];
            return typeof v === 'string' ? v : Array.isArray(v) ? String(v[0]) : undefined;
          });
          const outcome = await checkCredentials(parsed.data.email, parsed.data.password, ip);
          if (!outcome.ok) throw new Error(outcome.message);
          return { id: String(outcome.user.id), email: outcome.user.email, name: outcome.user.name };
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
          const claims = await sessionClaims(Number(user.id));
          if (claims) Object.assign(token, claims);
        }
        return token;
      },
      redirect({ url, baseUrl }) {
        const path = safeCallbackPath(url, baseUrl);
        return new URL(path ?? DEFAULT_LANDING, baseUrl).toString();
      },
      async session({ session, token }) {
        if (session.user) (session.user as { id?: number }).id = Number(token.uid);
        return session;
      },
    },
    events: {
      async signOut({ token }) {
        const sid = (token as { sid?: unknown } | null)?.sid;
        if (typeof sid === 'string') await revokeSession(sid);
      },
      async signIn({ user, account }) {
        const u = await getUserById(Number(user.id));
        log.info({ event: 'signin.ok', userId: u?.id, method: account?.provider }, 'signed in');
        await createAuditEntry({
          userId: u?.id ?? null,
          actor: u?.email ?? null,
          action: 'signin',
          detail: { method: account?.provider ?? 'unknown' },
        });
      },
    },
  };
  return cached;
}
