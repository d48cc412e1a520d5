import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { Session } from '../auth/session';
import { AppError, UNKNOWN_MESSAGE, toAppError } from './app-error';
import { CALLER_SHOWS_ERRORS } from './error-context';
import { Notifier } from './notifier';

/** Requests whose 401 is an answer, not a lapsed session. */
const OWN_401 = ['/api/auth/me', '/api/auth/sign-in'];

/** Shown when a session has lapsed and the user is sent to sign in again. */
export const SESSION_ENDED_MESSAGE = 'Your session has ended. Sign in again to carry on.';

/**
 * The one place where HTTP failures are turned into `AppError`. A 401 (except where it is the
 * answer itself) clears the session and sends the user to sign in, keeping where they were;
 * other errors go to the snack-bar unless the caller shows them itself.
 */
export const errorInterceptor: HttpInterceptorFn = (request, next) => {
  const router = inject(Router);
  const session = inject(Session);
  const notifier = inject(Notifier);
  return next(request).pipe(
    catchError((failure: unknown) => {
      const error =
        failure instanceof HttpErrorResponse
          ? toAppError(failure)
          : failure instanceof AppError
            ? failure
            : new AppError(0, 'unknown', UNKNOWN_MESSAGE);
      const path = request.url.split('?')[0];
      if (error.status === 401 && !OWN_401.includes(path)) {
        session.clear();
        const returnUrl = router.url;
        if (!router.url.startsWith('/sign-in')) {
          void router.navigate(['/sign-in'], {
            queryParams: returnUrl && returnUrl !== '/' ? { returnUrl } : {},
          });
          notifier.error(SESSION_ENDED_MESSAGE);
        }
      } else if (!request.context.get(CALLER_SHOWS_ERRORS)) {
        notifier.error(error.message);
      }
      return throwError(() => error);
    }),
  );
};
