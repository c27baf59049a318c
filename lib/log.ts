import pino from 'pino';

/**
 * Structured JSON logs. Secrets never reach them: the redaction list covers every field name that
 * can carry a password, token, key or cookie, wherever it sits in a logged object.
 */
const REDACT = [
  'password',
  'newPassword',
  'token',
  'key',
  'apiKey',
  'secret',
  'authorization',
  'cookie',
  '*.password',
  '*.newPassword',
  '*.token',
  '*.key',
  '*.apiKey',
  '*.secret',
  '*.authorization',
  '*.cookie',
  'headers.authorization',
  'headers.cookie',
  'req.headers.authorization',
  'req.headers.cookie',
];

function level(): string {
  const v = process.env.LOG_LEVEL;
  return v && ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'].includes(v) ? v : 'info';
}

const listeners = new Set<(line: string) => void>();
const stdout = pino.destination({ fd: 1, sync: false });
// Every line goes to stdout; tests (the secrets canary) can also listen to exactly what was written.
const sink = {
  write(line: string): void {
    stdout.write(line);
    for (const fn of listeners) fn(line);
  },
};

export const log = pino(
  {
    level: level(),
    base: { app: 'tropopass' },
    redact: { paths: REDACT, censor: '[redacted]' },
    timestamp: pino.stdTimeFunctions.isoTime,
  },
  sink,
);

/** Calls `fn` with every serialised log line from now on; the returned function stops it. */
export function onLogLine(fn: (line: string) => void): () => void {
  listeners.add(fn);
  return () => listeners.delete(fn);
}
