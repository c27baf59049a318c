import { ZodError } from 'zod';
import { log } from './log';
import type { FieldProblem } from '@/lib/validation/problems';

/**
 * The catalogue of application errors. Each carries its HTTP status and a message that is safe to
 * show; database, payment-service and stack details never reach a user.
 */
export type ErrorCode =
  | 'bad_request'
  | 'unauthenticated'
  | 'payment_required'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'too_large'
  | 'invalid_fields'
  | 'throttled'
  | 'unavailable'
  | 'internal';

export type { FieldProblem } from '@/lib/validation/problems';

const STATUS: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  payment_required: 402,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  invalid_fields: 422,
  throttled: 429,
  unavailable: 503,
  internal: 500,
};

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly status: number;
  readonly fields?: FieldProblem[];
  readonly retryAfterS?: number;
  readonly extra?: Record<string, unknown>;

  constructor(
    code: ErrorCode,
    message: string,
    opts: { fields?: FieldProblem[]; retryAfterS?: number; extra?: Record<string, unknown> } = {},
  ) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.status = STATUS[code];
    this.fields = opts.fields;
    this.retryAfterS = opts.retryAfterS;
    this.extra = opts.extra;
  }
}

export const badRequest = (message: string, fields?: FieldProblem[]) =>
  new AppError('bad_request', message, { fields });
export const unauthenticated = (message = 'Sign in first, or send a workspace API key.') =>
  new AppError('unauthenticated', message);
export const forbidden = (message = 'Your role in this workspace does not allow this.') =>
  new AppError('forbidden', message);
export const notFound = (message = 'Not found.') => new AppError('not_found', message);
export const conflict = (message: string, fields?: FieldProblem[]) => new AppError('conflict', message, { fields });
export const tooLarge = (message: string) => new AppError('too_large', message);
export const invalidFields = (fields: FieldProblem[], message = 'Some fields need attention.') =>
  new AppError('invalid_fields', message, { fields });
export const throttled = (retryAfterS: number, message = 'Too many requests. Try again shortly.') =>
  new AppError('throttled', message, { retryAfterS: Math.max(1, Math.ceil(retryAfterS)) });
export const paymentRequired = (message: string) => new AppError('payment_required', message);

/** Dotted paths (`route.waypoints.3.lat`) from a zod error, optionally under a prefix. */
export function zodFields(error: ZodError, prefix = ''): FieldProblem[] {
  return error.issues.map((issue) => {
    const path = [prefix, ...issue.path.map(String)].filter((p) => p !== '').join('.');
    return { path: path || '(body)', message: issue.message };
  });
}

export function fromZod(error: ZodError, prefix = ''): AppError {
  return invalidFields(zodFields(error, prefix));
}

interface FieldCarrier {
  fields: FieldProblem[];
  message: string;
}

/** The engine throws its own validation error (it cannot import this module); recognise it by shape. */
function isFieldCarrier(err: unknown): err is FieldCarrier & Error {
  return (
    err instanceof Error &&
    Array.isArray((err as Partial<FieldCarrier>).fields) &&
    ((err as Partial<FieldCarrier>).fields ?? []).every(
      (f) => typeof f === 'object' && f !== null && typeof (f as FieldProblem).path === 'string',
    )
  );
}

/** Turns any thrown value into an AppError; unknown errors become a logged 500 with no detail. */
export function normaliseError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return fromZod(err);
  if (isFieldCarrier(err)) return invalidFields(err.fields, err.message || 'Some fields need attention.');
  if (err instanceof RangeError) return invalidFields([{ path: '(input)', message: err.message }]);
  log.error({ err }, 'unexpected error');
  return new AppError('internal', 'Something went wrong on our side. Nothing was saved; try again.');
}

export interface ErrorBody {
  error: { code: ErrorCode; message: string; fields?: FieldProblem[] } & Record<string, unknown>;
}

export function errorBody(e: AppError): ErrorBody {
  return {
    error: { code: e.code, message: e.message, ...(e.fields ? { fields: e.fields } : {}), ...(e.extra ?? {}) },
  };
}

/** For route handlers: `{ error: { code, message, fields? } }` with the catalogue's status. */
export function toResponse(err: unknown): Response {
  const e = normaliseError(err);
  const headers: Record<string, string> = { 'cache-control': 'no-store' };
  if (e.retryAfterS) headers['retry-after'] = String(e.retryAfterS);
  return Response.json(errorBody(e), { status: e.status, headers });
}

export type ActionState<T = undefined> =
  | { ok: true; data?: T; message?: string }
  | { ok: false; error: { code: ErrorCode; message: string; fields?: FieldProblem[] } }
  | null;

/** For server actions: the same error shape, returned rather than thrown. */
export function toActionState(err: unknown): ActionState<never> {
  const e = normaliseError(err);
  return { ok: false, error: errorBody(e).error };
}
