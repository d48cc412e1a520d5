import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import * as z from 'zod';
import {
  classListSchema,
  classResponseSchema,
  type ClassCreate,
  type ClassUpdate,
  type SchoolClass,
} from '../../../shared/schemas/classes';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

const teacherListSchema = z.object({
  teachers: z.array(z.object({ id: z.string(), name: z.string(), email: z.string() })),
});
/** A teacher of the school, as `GET /api/school/teachers` lists them. */
export type TeacherRef = z.infer<typeof teacherListSchema>['teachers'][number];

/** The school's classes (`/api/classes`). */
@Injectable({ providedIn: 'root' })
export class ClassesApi {
  private readonly http = inject(HttpClient);

  /** The school's active teachers, to choose a class's teachers from. */
  teachers(): Observable<TeacherRef[]> {
    return this.http.get('/api/school/teachers').pipe(
      parseWith(teacherListSchema),
      map((b) => b.teachers),
    );
  }

  list(): Observable<SchoolClass[]> {
    return this.http.get('/api/classes').pipe(
      parseWith(classListSchema),
      map((b) => b.classes),
    );
  }

  /** The form shows this request's errors (e.g. 409 `name-taken`) itself. */
  create(body: ClassCreate): Observable<SchoolClass> {
    return this.http.post('/api/classes', body, { context: callerShowsErrors() }).pipe(
      parseWith(classResponseSchema),
      map((b) => b.class),
    );
  }

  /** The form shows this request's errors itself. */
  update(id: string, body: ClassUpdate): Observable<SchoolClass> {
    return this.http
      .patch(`/api/classes/${encodeURIComponent(id)}`, body, { context: callerShowsErrors() })
      .pipe(
        parseWith(classResponseSchema),
        map((b) => b.class),
      );
  }

  /** The page shows a refusal (409 `in-use`) itself. */
  remove(id: string): Observable<void> {
    return this.http
      .delete(`/api/classes/${encodeURIComponent(id)}`, { context: callerShowsErrors() })
      .pipe(map(() => undefined));
  }
}
