import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import {
  invitationInfoSchema,
  sessionResponseSchema,
  userResponseSchema,
  type InvitationInfo,
  type SessionUser,
  type SignIn,
} from '../../../shared/schemas/auth';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The `/api/auth` and `/api/invitations` routes. Forms show these errors themselves. */
@Injectable({ providedIn: 'root' })
export class AuthApi {
  private readonly http = inject(HttpClient);

  /** Sets the `XSRF-TOKEN` cookie that HttpClient sends back on every change request. */
  csrf(): Observable<void> {
    return this.http
      .get('/api/auth/csrf', { context: callerShowsErrors(), responseType: 'text' })
      .pipe(map(() => undefined));
  }

  /** The signed-in user, or null when signed out (200 either way: nothing for the console). */
  session(): Observable<SessionUser | null> {
    return this.http.get('/api/auth/session', { context: callerShowsErrors() }).pipe(
      parseWith(sessionResponseSchema),
      map((body) => body.user),
    );
  }

  /** The signed-in user; fails with a 401 AppError when signed out. */
  me(): Observable<SessionUser> {
    return this.http.get('/api/auth/me', { context: callerShowsErrors() }).pipe(
      parseWith(userResponseSchema),
      map((body) => body.user),
    );
  }

  signIn(credentials: SignIn): Observable<SessionUser> {
    return this.http.post('/api/auth/sign-in', credentials, { context: callerShowsErrors() }).pipe(
      parseWith(userResponseSchema),
      map((body) => body.user),
    );
  }

  signOut(): Observable<void> {
    return this.http
      .post('/api/auth/sign-out', null, { responseType: 'text' })
      .pipe(map(() => undefined));
  }

  /** Always answers 202, whether or not the address has an account. */
  requestReset(email: string): Observable<void> {
    return this.http
      .post('/api/auth/password-reset', { email }, { context: callerShowsErrors() })
      .pipe(map(() => undefined));
  }

  completeReset(token: string, password: string): Observable<void> {
    return this.http
      .post(
        '/api/auth/password-reset/complete',
        { token, password },
        { context: callerShowsErrors(), responseType: 'text' },
      )
      .pipe(map(() => undefined));
  }

  invitation(token: string): Observable<InvitationInfo> {
    return this.http
      .get(`/api/invitations/${encodeURIComponent(token)}`, { context: callerShowsErrors() })
      .pipe(parseWith(invitationInfoSchema));
  }

  acceptInvitation(
    token: string,
    body: { name: string; password: string },
  ): Observable<SessionUser> {
    return this.http
      .post(`/api/invitations/${encodeURIComponent(token)}/accept`, body, {
        context: callerShowsErrors(),
      })
      .pipe(
        parseWith(userResponseSchema),
        map((response) => response.user),
      );
  }
}
