import * as z from 'zod';
import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import {
  frameworkListSchema,
  outcomeListSchema,
  type Framework,
  type Outcome,
} from '../../../shared/schemas/outcomes';
import {
  unitListSchema,
  unitSchema,
  type Unit,
  type LessonOrder,
  type UnitCreate,
  type UnitStatus,
  type UnitSummary,
  type UnitUpdate,
} from '../../../shared/schemas/units';
import { downloadWithProgress, type DownloadEvent } from '../files/transfer';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The filters of the units tables (`GET /api/units`). */
export interface UnitFilters {
  scope: 'mine' | 'library';
  yearLevel: number | null;
  term: number | null;
  status: UnitStatus | null;
  /** A teacher's id: only units they own. */
  owner: string | null;
  q: string;
}

const teacherListSchema = z.object({
  teachers: z.array(z.object({ id: z.string(), name: z.string(), email: z.string() })),
});
/** A teacher of the school (`GET /api/school/teachers`). */
export type TeacherRef = z.infer<typeof teacherListSchema>['teachers'][number];

/** The printables of a unit (`/api/units/:id/pack.pdf`, `/prep.ics`). */
export type UnitPrintable = 'pack.pdf' | 'prep.ics';

/** Units (`/api/units`). */
@Injectable({ providedIn: 'root' })
export class UnitsApi {
  private readonly http = inject(HttpClient);

  list(filters: UnitFilters): Observable<UnitSummary[]> {
    let params = new HttpParams().set('scope', filters.scope);
    if (filters.yearLevel !== null) params = params.set('yearLevel', filters.yearLevel);
    if (filters.term !== null) params = params.set('term', filters.term);
    if (filters.status !== null) params = params.set('status', filters.status);
    if (filters.owner !== null) params = params.set('owner', filters.owner);
    if (filters.q.trim()) params = params.set('q', filters.q.trim());
    return this.http.get('/api/units', { params }).pipe(
      parseWith(unitListSchema),
      map((body) => body.units),
    );
  }

  /** The school's teachers, for the owner filter. */
  teachers(): Observable<TeacherRef[]> {
    return this.http.get('/api/school/teachers').pipe(
      parseWith(teacherListSchema),
      map((body) => body.teachers),
    );
  }

  get(id: string): Observable<Unit> {
    return this.http.get(`/api/units/${encodeURIComponent(id)}`).pipe(parseWith(unitSchema));
  }

  /** The form shows a 400's field errors under its fields. */
  create(unit: UnitCreate): Observable<Unit> {
    return this.http
      .post('/api/units', unit, { context: callerShowsErrors() })
      .pipe(parseWith(unitSchema));
  }

  /** The editor shows a 400 under its fields and a 409 (stale version) with Reload / Re-apply. */
  update(id: string, change: UnitUpdate): Observable<Unit> {
    return this.http
      .patch(`/api/units/${encodeURIComponent(id)}`, change, { context: callerShowsErrors() })
      .pipe(parseWith(unitSchema));
  }

  /** The editor shows a 409 itself (the unit or its lessons changed meanwhile). */
  reorder(id: string, order: LessonOrder): Observable<Unit> {
    return this.http
      .put(`/api/units/${encodeURIComponent(id)}/lesson-order`, order, {
        context: callerShowsErrors(),
      })
      .pipe(parseWith(unitSchema));
  }

  /** Deletes the unit and its lessons; `version` makes a stale delete a 409 (shown by the caller). */
  remove(id: string, version: number): Observable<unknown> {
    return this.http.delete(`/api/units/${encodeURIComponent(id)}`, {
      params: new HttpParams().set('version', version),
      context: callerShowsErrors(),
    });
  }

  /** Downloads a printable with progress; its errors go to the interceptor's snack-bar. */
  download(id: string, file: UnitPrintable): Observable<DownloadEvent> {
    return downloadWithProgress(this.http, `/api/units/${encodeURIComponent(id)}/${file}`);
  }

  frameworks(): Observable<Framework[]> {
    return this.http.get('/api/outcomes/frameworks').pipe(
      parseWith(frameworkListSchema),
      map((body) => body.frameworks),
    );
  }

  /** Outcomes of a framework matching `q` (the server caps the answer and says so). */
  outcomes(
    frameworkId: string,
    q: string,
  ): Observable<{ outcomes: Outcome[]; truncated: boolean }> {
    let params = new HttpParams().set('frameworkId', frameworkId);
    if (q.trim()) params = params.set('q', q.trim());
    return this.http.get('/api/outcomes', { params }).pipe(parseWith(outcomeListSchema));
  }
}
