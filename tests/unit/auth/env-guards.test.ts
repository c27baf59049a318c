import { afterEach, describe, expect, it } from 'vitest';
import { env, resetEnvForTests } from '@/lib/env';

const saved = { ...process.env };
function start(vars: Record<string, string>): () => unknown {
  for (const k of ['MAIL_OUTBOX', 'NEXTAUTH_URL', 'STRIPE_API_HOST', 'STRIPE_SECRET_KEY', 'STRIPE_WEBHOOK_SECRET'])
    delete process.env[k];
  Object.assign(process.env, { NEXTAUTH_SECRET: 'env-guard-secret-0123456789', ...vars });
  resetEnvForTests();
  return () => env();
}
afterEach(() => {
  for (const k of Object.keys(process.env)) if (!(k in saved)) delete process.env[k];
  Object.assign(process.env, saved);
  resetEnvForTests();
});

describe('settings safe only on one machine', () => {
  it('refuses MAIL_OUTBOX=1 unless the app URL is a loopback address', () => {
    expect(start({ MAIL_OUTBOX: '1', NEXTAUTH_URL: 'https://app.operator.example' })).toThrow(/MAIL_OUTBOX.*loopback/);
    expect(start({ MAIL_OUTBOX: '1', NEXTAUTH_URL: 'http://10.0.0.5:3000' })).toThrow(/MAIL_OUTBOX/);
    expect(start({ MAIL_OUTBOX: '1', NEXTAUTH_URL: 'http://127.0.0.1:3000' })).not.toThrow();
    expect(start({ MAIL_OUTBOX: '1', NEXTAUTH_URL: 'http://localhost:3000' })).not.toThrow();
    expect(start({ MAIL_OUTBOX: '1', NEXTAUTH_URL: 'http://[::1]:3000' })).not.toThrow();
    expect(
      start({
        NEXTAUTH_URL: 'https://app.operator.example',
        STRIPE_SECRET_KEY: 'sk_live_x',
        STRIPE_WEBHOOK_SECRET: 'whsec_x',
      }),
    ).not.toThrow();
  });

  it('refuses the public payment defaults unless the payment host is the local fake', () => {
    expect(start({ STRIPE_API_HOST: 'api.payments.example' })).toThrow(/STRIPE_SECRET_KEY[\s\S]*STRIPE_WEBHOOK_SECRET/);
    expect(start({ STRIPE_API_HOST: 'api.payments.example', STRIPE_SECRET_KEY: 'sk_live_abc' })).toThrow(
      /STRIPE_WEBHOOK_SECRET/,
    );
    expect(
      start({
        STRIPE_API_HOST: 'api.payments.example',
        STRIPE_SECRET_KEY: 'sk_live_abc',
        STRIPE_WEBHOOK_SECRET: 'whsec_real',
      }),
    ).not.toThrow();
    expect(start({ STRIPE_API_HOST: '127.0.0.1' })).not.toThrow();
  });
});
