/**
 * The local stand-in for an SMTP relay: accepts every message on loopback, keeps it (in memory and
 * appended to a JSON-lines file, so a restart keeps the outbox) and serves the outbox as JSON over
 * HTTP for the outbox page and the tests. Never imported by app code.
 */
import fs from 'node:fs';
import path from 'node:path';
import http from 'node:http';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';

export interface StoredMessage {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  /** The Message-ID header as sent, e.g. `<key@host>` ('' when absent). */
  messageId?: string;
  text: string;
  html: string;
  attachments: { filename: string; contentType: string; size: number; contentBase64: string }[];
}

export interface SmtpFakeOptions {
  smtpPort: number;
  httpPort: number;
  storeFile?: string;
  host?: string;
}

export interface SmtpFake {
  smtpPort: number;
  httpPort: number;
  messages(): StoredMessage[];
  close(): Promise<void>;
}

function addressList(v: unknown): string[] {
  const list = Array.isArray(v) ? v : v ? [v] : [];
  return list
    .flatMap((a: { value?: { address?: string }[] }) => (a.value ?? []).map((x) => x.address ?? ''))
    .filter(Boolean);
}

export async function startSmtpFake(opts: SmtpFakeOptions): Promise<SmtpFake> {
  const host = opts.host ?? '127.0.0.1';
  const messages: StoredMessage[] = [];
  if (opts.storeFile) {
    fs.mkdirSync(path.dirname(opts.storeFile), { recursive: true });
    if (fs.existsSync(opts.storeFile)) {
      for (const line of fs.readFileSync(opts.storeFile, 'utf8').split('\n')) {
        if (line.trim()) messages.push(JSON.parse(line) as StoredMessage);
      }
    }
  }
  let nextId = messages.reduce((m, x) => Math.max(m, x.id), 0) + 1;

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const msg: StoredMessage = {
            id: nextId++,
            receivedAt: new Date().toISOString(),
            from: addressList(parsed.from)[0] ?? '',
            to: [...addressList(parsed.to), ...addressList(parsed.cc)],
            subject: parsed.subject ?? '',
            messageId: parsed.messageId ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            attachments: parsed.attachments.map((a) => ({
              filename: a.filename ?? 'attachment',
              contentType: a.contentType,
              size: a.size,
              contentBase64: a.content.toString('base64'),
            })),
          };
          messages.push(msg);
          if (opts.storeFile) fs.appendFileSync(opts.storeFile, `${JSON.stringify(msg)}\n`);
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });

  const web = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', `http://${host}`);
    const send = (status: number, body: unknown) => {
      res.writeHead(status, { 'content-type': 'application/json' });
      res.end(JSON.stringify(body));
    };
    if (req.method === 'GET' && url.pathname === '/messages') {
      const to = url.searchParams.get('to')?.toLowerCase();
      const list = messages
        .filter((m) => !to || m.to.some((a) => a.toLowerCase() === to))
        .map(({ attachments, ...rest }) => ({
          ...rest,
          attachments: attachments.map(({ contentBase64: _c, ...a }) => a),
        }));
      return send(200, { items: list.reverse() });
    }
    const att = /^\/messages\/(\d+)\/attachments\/(\d+)$/.exec(url.pathname);
    if (req.method === 'GET' && att) {
      const m = messages.find((x) => x.id === Number(att[1]));
      const a = m?.attachments[Number(att[2])];
      if (!a) return send(404, { error: 'not found' });
      res.writeHead(200, { 'content-type': a.contentType });
      return res.end(Buffer.from(a.contentBase64, 'base64'));
    }
    if (req.method === 'DELETE' && url.pathname === '/messages') {
      messages.length = 0;
      if (opts.storeFile) fs.writeFileSync(opts.storeFile, '');
      return send(200, { ok: true });
    }
    send(404, { error: 'not found' });
  });

  await new Promise<void>((resolve, reject) => {
    smtp.once('error', reject);
    smtp.listen(opts.smtpPort, host, () => resolve());
  });
  await new Promise<void>((resolve, reject) => {
    web.once('error', reject);
    web.listen(opts.httpPort, host, () => resolve());
  });
  const smtpAddr = (smtp as unknown as { server: import('node:net').Server }).server.address();
  const webAddr = web.address();
  return {
    smtpPort: typeof smtpAddr === 'object' && smtpAddr ? smtpAddr.port : opts.smtpPort,
    httpPort: typeof webAddr === 'object' && webAddr ? webAddr.port : opts.httpPort,
    messages: () => messages.slice(),
    close: () =>
      new Promise<void>((resolve) => {
        web.close(() => smtp.close(() => resolve()));
      }),
  };
}

const isMain = process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename ?? '');
if (isMain) {
  const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
  const httpPort = Number(process.env.MAIL_FAKE_HTTP_PORT ?? 2580);
  const storeFile = process.env.MAIL_FAKE_STORE ?? '.data/mail-fake.jsonl';
  startSmtpFake({ smtpPort, httpPort, storeFile }).then(
    (f) => console.log(`SMTP fake on 127.0.0.1:${f.smtpPort}, outbox JSON on http://127.0.0.1:${f.httpPort}/messages`),
    (err: Error) => {
      console.error(`SMTP fake could not start: ${err.message}`);
      process.exit(1);
    },
  );
}
