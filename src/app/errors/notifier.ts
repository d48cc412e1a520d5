import { Injectable, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { AppError, UNKNOWN_MESSAGE } from './app-error';

/** Shows results and the errors no form handles in a snack-bar. */
@Injectable({ providedIn: 'root' })
export class Notifier {
  private readonly snackBar = inject(MatSnackBar);

  /** A short result ("Invitation sent."), gone after a few seconds. */
  info(message: string): void {
    this.snackBar.open(message, 'OK', { duration: 6000, politeness: 'polite' });
  }

  /** An error stays until dismissed, so nobody misses it (WCAG 2.2 SC 2.2.1). */
  error(message: string): void {
    this.snackBar.open(message, 'Dismiss', { politeness: 'assertive' });
  }

  /**
   * Shows a failure the error interceptor has not shown: a response that failed its schema
   * (parsed after the interceptor) or an error that is not an AppError at all. HTTP failures of
   * requests without `callerShowsErrors()` were already shown, so they are skipped here.
   */
  errorNotShownYet(error: unknown): void {
    if (!(error instanceof AppError)) {
      this.error(UNKNOWN_MESSAGE);
    } else if (error.code === 'unexpected-response') {
      this.error(error.message);
    }
  }
}
