import { ErrorHandler, Injectable, Injector, inject } from '@angular/core';
import { AppError } from './app-error';
import { Notifier } from './notifier';

/**
 * Logs every error that reaches Angular. API failures were already shown by the interceptor or
 * the form, so they are logged as warnings without a stack; a response that failed its schema
 * never passed the interceptor, so it is also shown here; anything else is a bug.
 */
@Injectable()
export class LoggingErrorHandler implements ErrorHandler {
  // Looked up lazily: the snack-bar depends on services that may themselves fail to start.
  private readonly injector = inject(Injector);

  handleError(error: unknown): void {
    const cause = unwrap(error);
    if (cause instanceof AppError) {
      console.warn(`[trayplan] ${cause.status} ${cause.code}: ${cause.message}`, cause.details);
      this.injector.get(Notifier).errorNotShownYet(cause);
      return;
    }
    console.error('[trayplan] unexpected error', error);
  }
}

/** Errors from a rejected promise or an rxjs subscriber can arrive wrapped. */
function unwrap(error: unknown): unknown {
  const wrapped = error as { rejection?: unknown } | null;
  return typeof wrapped === 'object' && wrapped !== null && 'rejection' in wrapped
    ? wrapped.rejection
    : error;
}
