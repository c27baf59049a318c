/**
 * `npm run demo`, last step: starts every local fake and the built app on 127.0.0.1 with the demo
 * settings, prints the URL, the ports and the demo sign-ins, and stops everything together on Ctrl-C.
 * Ports left to their defaults move to free ones when taken (demo-ports.ts); a port set in the
 * environment that is taken stops the demo with one message naming the variable.
 */
import fs from 'node:fs';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { concurrently } from 'concurrently';
import { DemoPortError, describePorts, resolveDemoPorts, type ResolvedPort } from './demo-ports';

const root = process.cwd();
const dataDir = path.join(root, '.data');
fs.mkdirSync(dataDir, { recursive: true });

// A per-machine secret for the demo, made once and kept beside the demo database.
const secretFile = path.join(dataDir, 'demo-secret');
if (!fs.existsSync(secretFile)) fs.writeFileSync(secretFile, randomBytes(32).toString('base64url'), { mode: 0o600 });

let resolved: ResolvedPort[];
try {
  resolved = await resolveDemoPorts(process.env);
} catch (err) {
  if (!(err instanceof DemoPortError)) throw err;
  console.error(`\nTropopass demo not started: ${err.message}\n`);
  process.exit(1);
}
const portOf = (variable: string) => String(resolved.find((p) => p.variable === variable)?.port);
const port = portOf('PORT');
const url = `http://127.0.0.1:${port}`;
const env = {
  NEXTAUTH_URL: url,
  NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? fs.readFileSync(secretFile, 'utf8').trim(),
  MAIL_OUTBOX: '1',
  SMTP_PORT: portOf('SMTP_PORT'),
  MAIL_FAKE_HTTP_PORT: portOf('MAIL_FAKE_HTTP_PORT'),
  MAIL_FAKE_HTTP_URL: `http://127.0.0.1:${portOf('MAIL_FAKE_HTTP_PORT')}`,
  PAYMENT_FAKE_PORT: portOf('PAYMENT_FAKE_PORT'),
  STRIPE_API_PORT: portOf('PAYMENT_FAKE_PORT'),
  PAYMENT_WEBHOOK_URL: `${url}/api/webhooks/stripe`,
  STRIPE_WEBHOOK_SECRET: process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_tropopass_demo_local',
};

const commands = [
  { name: 'mail', command: 'tsx lib/fakes/smtp/server.ts', env },
  { name: 'payments', command: 'tsx lib/fakes/payment/server.ts', env },
  { name: 'app', command: `next start -H 127.0.0.1 -p ${port}`, env },
];

const { result } = concurrently(commands, {
  killOthersOn: ['failure', 'success'],
  prefixColors: ['gray', 'yellow', 'cyan'],
});

setTimeout(() => {
  console.log(
    [
      '',
      `Tropopass demo: ${url}`,
      'Ports:',
      ...describePorts(resolved),
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
