import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import { userResponseSchema, type SessionUser } from '../../../shared/schemas/auth';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The signed-in user's own account (`/api/account`). */
@Injectable({ providedIn: 'root' })
export class AccountApi {
  private readonly http = inject(HttpClient);

  get(): Observable<SessionUser> {
    return this.http.get('/api/account').pipe(
      parseWith(userResponseSchema),
      map((body) => body.user),
    );
  }

  rename(name: string): Observable<SessionUser> {
    return this.http.patch('/api/account', { name }, { context: callerShowsErrors() }).pipe(
      parseWith(userResponseSchema),
      map((body) => body.user),
    );
  }

  changePassword(currentPassword: string, newPassword: string): Observable<void> {
    return this.http
      .post(
        '/api/account/password',
        { currentPassword, newPassword },
        { context: callerShowsErrors(), responseType: 'text' },
      )
      .pipe(map(() => undefined));
  }
}
