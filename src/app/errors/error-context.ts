import { HttpContext, HttpContextToken } from '@angular/common/http';

/**
 * Whether the caller shows this request's errors itself (a form under its fields, a page inline).
 * When false (the default), the error interceptor shows them in a snack-bar.
 */
export const CALLER_SHOWS_ERRORS = new HttpContextToken<boolean>(() => false);

/** Context for requests whose errors the caller shows itself. */
export function callerShowsErrors(): HttpContext {
  return new HttpContext().set(CALLER_SHOWS_ERRORS, true);
}
