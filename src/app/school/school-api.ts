import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import {
  schoolSettingsResponseSchema,
  timeZoneListSchema,
  type SchoolSettings,
  type SchoolSettingsUpdate,
} from '../../../shared/schemas/school';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The school's settings and calendar (`/api/school`). */
@Injectable({ providedIn: 'root' })
export class SchoolApi {
  private readonly http = inject(HttpClient);

  get(): Observable<SchoolSettings> {
    return this.http.get('/api/school').pipe(
      parseWith(schoolSettingsResponseSchema),
      map((b) => b.school),
    );
  }

  /** The IANA zone names the server knows, for the searchable select. */
  timezones(): Observable<string[]> {
    return this.http.get('/api/school/timezones').pipe(
      parseWith(timeZoneListSchema),
      map((b) => b.timezones),
    );
  }

  /** Saves everything at once; the form shows 400 details and a 409 (stale version) itself. */
  save(body: SchoolSettingsUpdate): Observable<SchoolSettings> {
    return this.http.put('/api/school', body, { context: callerShowsErrors() }).pipe(
      parseWith(schoolSettingsResponseSchema),
      map((b) => b.school),
    );
  }
}
