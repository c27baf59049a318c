import 'server-only';
import { AppError, normaliseError, paymentRequired } from '@/lib/errors';
import { log } from '@/lib/log';
import { describeStripeError, isStripeError, isTransientStripeError } from './stripe';

/**
 * A payment-service failure during a finance admin's action, as an error in a planner's words. The
 * service's own text goes to the log only.
 */
export function providerError(err: unknown, action: string): AppError {
  if (err instanceof AppError) return err;
  if (isStripeError(err)) {
    log.warn(
      { event: 'billing.provider_error', action, error: describeStripeError(err) },
      'payment service refused or failed',
    );
    if (err.type === 'StripeCardError' || err.code === 'card_declined') {
      return paymentRequired('The card was declined. Put the test card that succeeds on file, then try again.');
    }
    if (isTransientStripeError(err)) {
      return new AppError(
        'unavailable',
        'The payment service did not answer in time. Nothing was changed; try again in a minute.',
      );
    }
    return new AppError(
      'unavailable',
      'The payment service refused this change, so nothing was changed. Try again; if it keeps happening, contact support.',
    );
  }
  return normaliseError(err);
}
