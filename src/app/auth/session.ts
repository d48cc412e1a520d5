import { Injectable, computed, inject, signal } from '@angular/core';
import {
  catchError,
  firstValueFrom,
  forkJoin,
  from,
  of,
  switchMap,
  tap,
  type Observable,
  map,
} from 'rxjs';
import type { SessionUser, SignIn } from '../../../shared/schemas/auth';
import { AppError } from '../errors/app-error';
import { Notifier } from '../errors/notifier';
import { forgetSavedCopies, markSavedFor, savedForSomeoneElse } from '../offline/forget';
import { SavedCopies } from '../offline/saved-copies';
import { AuthApi } from './auth-api';

/**
 * Who is signed in, for the whole client. Loaded once at start-up (`start()`); the server stays
 * the authority and answers 401 or 403 whatever this says.
 */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly api = inject(AuthApi);
  private readonly notifier = inject(Notifier);
  private readonly copies = inject(SavedCopies);
  private readonly current = signal<SessionUser | null>(null);
  private started: Promise<void> | null = null;

  /** The signed-in user, or null when signed out. */
  readonly user = this.current.asReadonly();
  /** Whether someone is signed in. */
  readonly signedIn = computed(() => this.current() !== null);

  /**
   * Fetches the CSRF cookie, then `/api/auth/session`, once; later calls return the same
   * promise. Never rejects: failures are shown and mean signed out. Asking `/session` rather
   * than `/me` keeps a signed-out visit free of a 401 in the browser's console.
   */
  start(): Promise<void> {
    this.started ??= this.load();
    return this.started;
  }

  private async load(): Promise<void> {
    await firstValueFrom(this.refreshCsrf());
    try {
      const user = await firstValueFrom(this.api.session());
      if (user) await firstValueFrom(this.claim(user));
      this.current.set(user);
    } catch (error) {
      this.current.set(null);
      if (!(error instanceof AppError && error.status === 401)) {
        this.notifier.error(error instanceof AppError ? error.message : String(error));
      }
    }
  }

  /** Signs in and takes a fresh CSRF token for the new session. */
  signIn(credentials: SignIn): Observable<SessionUser> {
    return this.api.signIn(credentials).pipe(switchMap((user) => this.begin(user)));
  }

  /** Accepts an invitation, which signs the new member in. */
  acceptInvitation(
    token: string,
    body: { name: string; password: string },
  ): Observable<SessionUser> {
    return this.api.acceptInvitation(token, body).pipe(switchMap((user) => this.begin(user)));
  }

  /**
   * Signs out, and this browser forgets every copy it saved for the person (the next person on
   * a shared device must not find their lessons). `freshPage`: a service worker was removed, so
   * the caller should load the next page afresh, which installs a new, empty worker.
   */
  signOut(): Observable<{ freshPage: boolean }> {
    return this.api.signOut().pipe(
      tap(() => {
        this.current.set(null);
        this.copies.clear();
      }),
      switchMap(() => forkJoin([from(forgetSavedCopies()), this.refreshCsrf()])),
      map(([freshPage]) => ({ freshPage })),
    );
  }

  /** Replaces the user after an edit of the account (e.g. a new name). */
  update(user: SessionUser): void {
    this.current.set(user);
  }

  /** Forgets the user after the server said the session is gone. */
  clear(): void {
    this.current.set(null);
  }

  private begin(user: SessionUser): Observable<SessionUser> {
    return this.claim(user).pipe(
      tap(() => this.current.set(user)),
      switchMap(() => this.refreshCsrf()),
      map(() => user),
    );
  }

  /**
   * Another person's saved copies (their session ran out, nobody signed out) are forgotten
   * before this person's page shows; the same person's are kept (at once, nothing to wait for).
   */
  private claim(user: SessionUser): Observable<unknown> {
    const forget: Observable<unknown> = savedForSomeoneElse(user.id)
      ? from(forgetSavedCopies()).pipe(tap(() => this.copies.clear()))
      : of(null);
    return forget.pipe(tap(() => markSavedFor(user.id)));
  }

  /**
   * The server may bind the token to the session, which changes on sign-in and sign-out. A failure
   * here is not fatal: the next change request then fails with a 403 that is shown.
   */
  private refreshCsrf(): Observable<void> {
    return this.api.csrf().pipe(
      catchError((error: unknown) => {
        console.warn('[trayplan] could not fetch the CSRF cookie', error);
        return of(undefined);
      }),
    );
  }
}
