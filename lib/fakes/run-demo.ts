/**
 * `npm run demo`, last step: starts every local fake and the built app on 127.0.0.1 with the demo
 * settings, prints the URL and the demo sign-ins, and stops everything together on Ctrl-C.
 */
import fs from 'node:fs';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { concurrently } from 'concurrently';

const root = process.cwd();
const dataDir = path.join(root, '.data');
fs.mkdirSync(dataDir, { recursive: true });

// A per-machine secret for the demo, made once and kept beside the demo database.
const secretFile = path.join(dataDir, 'demo-secret');
if (!fs.existsSync(secretFile)) fs.writeFileSync(secretFile, randomBytes(32).toString('base64url'), { mode: 0o600 });

const port = process.env.PORT ?? '3000';
const url = `http://127.0.0.1:${port}`;
const env = {
  NEXTAUTH_URL: url,
  NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? fs.readFileSync(secretFile, 'utf8').trim(),
  MAIL_OUTBOX: '1',
  SMTP_PORT: process.env.SMTP_PORT ?? '2525',
  MAIL_FAKE_HTTP_PORT: process.env.MAIL_FAKE_HTTP_PORT ?? '2580',
  MAIL_FAKE_HTTP_URL: `http://127.0.0.1:${process.env.MAIL_FAKE_HTTP_PORT ?? '2580'}`,
  PAYMENT_FAKE_PORT: process.env.PAYMENT_FAKE_PORT ?? '12111',
  STRIPE_API_PORT: process.env.PAYMENT_FAKE_PORT ?? '12111',
  PAYMENT_WEBHOOK_URL: `${url}/api/webhooks/stripe`,
  STRIPE_WEBHOOK_SECRET: process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_tropopass_demo_local',
};

const commands = [
  { name: 'mail', command: 'tsx lib/fakes/smtp/server.ts', env },
  { name: 'payments', command: 'tsx lib/fakes/payment/server.ts', env },
  { name: 'app', command: `next start -H 127.0.0.1 -p ${port}`, env },
];

const { result } = concurrently(commands, { killOthersOn: ['failure', 'success'], prefixColors: ['gray', 'yellow', 'cyan'] });

setTimeout(() => {
  console.log(
    [
      '',
      `Tropopass demo: ${url}`,
      'Sign in with any of these (password: tropopass-demo):',
      '  consultant@tropopass.test  owner of skarn-polar, velloway-jets, kestrel-mach',
      '  planner@tropopass.test     flight planner in skarn-polar',
      '  analyst@tropopass.test     sustainability analyst in skarn-polar',
      '  viewer@tropopass.test      read-only in velloway-jets',
      '  billing@tropopass.test     finance admin in skarn-polar',
      `E-mail sent by the demo: ${url}/outbox`,
      '',
    ].join('\n'),
  );
}, 1500);

result.then(
  () => process.exit(0),
  () => process.exit(1),
);
