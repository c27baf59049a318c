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

export const log = pino({
  level: level(),
  base: { app: 'tropopass' },
  redact: { paths: REDACT, censor: '[redacted]' },
  timestamp: pino.stdTimeFunctions.isoTime,
});
