/** Error replies in the payment API's shape: `{ error: { type, code, message, param?, decline_code? } }`. */

export type ApiErrorType =
  'invalid_request_error' | 'card_error' | 'api_error' | 'idempotency_error' | 'rate_limit_error';

export interface ApiErrorBody {
  type: ApiErrorType;
  message: string;
  code?: string;
  param?: string;
  decline_code?: string;
  payment_method?: { id: string; type: 'card' };
}

export class FakeApiError extends Error {
  readonly status: number;
  readonly body: ApiErrorBody;

  constructor(status: number, body: ApiErrorBody) {
    super(body.message);
    this.status = status;
    this.body = body;
  }
}

export function invalidRequest(message: string, param?: string, code?: string): FakeApiError {
  return new FakeApiError(400, { type: 'invalid_request_error', message, param, code });
}

/**
 * An id that names nothing: 404 when the id is in the path, 400 naming the parameter when it came in a
 * parameter, as the API does.
 */
export function resourceMissing(kind: string, id: string, param?: string): FakeApiError {
  return new FakeApiError(param ? 400 : 404, {
    type: 'invalid_request_error',
    code: 'resource_missing',
    message: `No such ${kind}: '${id}'`,
    param,
  });
}

export function unknownRoute(method: string, path: string): FakeApiError {
  return new FakeApiError(404, {
    type: 'invalid_request_error',
    message: `Unrecognized request URL (${method}: ${path}). The local payment fake does not implement it.`,
  });
}

export function cardDeclined(paymentMethodId: string): FakeApiError {
  return new FakeApiError(402, {
    type: 'card_error',
    code: 'card_declined',
    decline_code: 'generic_decline',
    message: 'Your card was declined.',
    payment_method: { id: paymentMethodId, type: 'card' },
  });
}

export function authenticationError(message: string): FakeApiError {
  return new FakeApiError(401, { type: 'invalid_request_error', message });
}
