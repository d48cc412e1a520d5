import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { catchError, map, of, type Observable } from 'rxjs';
import { devMailListSchema, type DevMail } from '../../../shared/schemas/members';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The development mail outbox: what the fake SMTP server received. 404 in production. */
@Injectable({ providedIn: 'root' })
export class DevMailApi {
  private readonly http = inject(HttpClient);

  /** Newest first. */
  list(): Observable<DevMail[]> {
    return this.http.get('/api/dev/mail').pipe(
      parseWith(devMailListSchema),
      map((body) =>
        [...body.messages].sort((a, b) => Date.parse(b.receivedAt) - Date.parse(a.receivedAt)),
      ),
    );
  }

  /** Whether the outbox exists here (development); never fails. */
  available(): Observable<boolean> {
    return this.http.get('/api/dev/mail', { context: callerShowsErrors() }).pipe(
      map(() => true),
      catchError(() => of(false)),
    );
  }
}
