import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import { userResponseSchema, type SessionUser } from '../../../shared/schemas/auth';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';
import {
  reminderPreferencesSchema,
  type ReminderPreferences,
  type ReminderPreferencesUpdate,
} from '../../../shared/schemas/reminders';
import * as z from 'zod';

const remindersAnswer = z.object({ reminders: reminderPreferencesSchema });

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

  /** The person's reminder e-mails (version 0 until first saved). */
  reminders(): Observable<ReminderPreferences> {
    return this.http.get('/api/account/reminders').pipe(
      parseWith(remindersAnswer),
      map((body) => body.reminders),
    );
  }

  /** The page shows a 409 (changed in another tab) itself. */
  saveReminders(change: ReminderPreferencesUpdate): Observable<ReminderPreferences> {
    return this.http.patch('/api/account/reminders', change, { context: callerShowsErrors() }).pipe(
      parseWith(remindersAnswer),
      map((body) => body.reminders),
    );
  }
}
