import * as z from 'zod';
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import { classListSchema, type SchoolClass } from '../../../shared/schemas/classes';
import {
  kitTypeListSchema,
  kitTypeResponseSchema,
  tubListSchema,
  type KitType,
  type KitTypeSummary,
  type TubSummary,
} from '../../../shared/schemas/kits';
import {
  activitySchema,
  attachmentSchema,
  lessonSchema,
  type Activity,
  type ActivityCreate,
  type ActivityUpdate,
  type Attachment,
  type Lesson,
  type LessonCreate,
  type LessonUpdate,
} from '../../../shared/schemas/lessons';
import { schoolSettingsResponseSchema, type BellPeriod } from '../../../shared/schemas/school';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';
import { uploadWithProgress } from '../files/transfer';

/** Progress of an attachment upload (percent, or null when unknown), then the stored file. */
export type UploadEvent =
  { kind: 'progress'; percent: number | null } | { kind: 'done'; attachment: Attachment };

const enc = encodeURIComponent;

/**
 * What the lesson and activity editors read and write. Every write shows its own errors (field
 * details under fields, a 409 with Reload and Re-apply), so they all carry `callerShowsErrors()`.
 */
const reliefTeacherListSchema = z.object({
  teachers: z.array(z.object({ id: z.string(), name: z.string(), email: z.string() })),
});
export type ReliefTeacher = z.infer<typeof reliefTeacherListSchema>['teachers'][number];

@Injectable({ providedIn: 'root' })
export class LessonFormApi {
  private readonly http = inject(HttpClient);

  lesson(id: string): Observable<Lesson> {
    return this.http.get(`/api/lessons/${enc(id)}`).pipe(parseWith(lessonSchema));
  }

  /** The school's relief teachers, to assign one to a lesson (`GET /api/relief/teachers`). */
  reliefTeachers(): Observable<ReliefTeacher[]> {
    return this.http.get('/api/relief/teachers').pipe(
      parseWith(reliefTeacherListSchema),
      map((b) => b.teachers),
    );
  }

  classes(): Observable<SchoolClass[]> {
    return this.http.get('/api/classes').pipe(
      parseWith(classListSchema),
      map((b) => b.classes),
    );
  }

  kitTypes(): Observable<KitTypeSummary[]> {
    return this.http.get('/api/kit-types').pipe(
      parseWith(kitTypeListSchema),
      map((b) => b.kitTypes),
    );
  }

  /** A kit type with its parts list (for the materials autocomplete). */
  kitType(id: string): Observable<KitType> {
    return this.http.get(`/api/kit-types/${enc(id)}`).pipe(
      parseWith(kitTypeResponseSchema),
      map((b) => b.kitType),
    );
  }

  tubs(kitTypeId: string): Observable<TubSummary[]> {
    return this.http.get('/api/tubs', { params: { kitTypeId } }).pipe(
      parseWith(tubListSchema),
      map((b) => b.tubs),
    );
  }

  /** The school's bell times. */
  periods(): Observable<BellPeriod[]> {
    return this.http.get('/api/school').pipe(
      parseWith(schoolSettingsResponseSchema),
      map((b) => b.school.periods),
    );
  }

  create(unitId: string, body: LessonCreate): Observable<Lesson> {
    return this.http
      .post(`/api/units/${enc(unitId)}/lessons`, body, { context: callerShowsErrors() })
      .pipe(parseWith(lessonSchema));
  }

  update(id: string, change: LessonUpdate): Observable<Lesson> {
    return this.http
      .patch(`/api/lessons/${enc(id)}`, change, { context: callerShowsErrors() })
      .pipe(parseWith(lessonSchema));
  }

  reorder(id: string, version: number, activityIds: string[]): Observable<Lesson> {
    return this.http
      .put(
        `/api/lessons/${enc(id)}/activity-order`,
        { version, activityIds },
        { context: callerShowsErrors() },
      )
      .pipe(parseWith(lessonSchema));
  }

  createActivity(lessonId: string, body: ActivityCreate): Observable<Activity> {
    return this.http
      .post(`/api/lessons/${enc(lessonId)}/activities`, body, { context: callerShowsErrors() })
      .pipe(parseWith(activitySchema));
  }

  updateActivity(id: string, change: ActivityUpdate): Observable<Activity> {
    return this.http
      .patch(`/api/activities/${enc(id)}`, change, { context: callerShowsErrors() })
      .pipe(parseWith(activitySchema));
  }

  deleteActivity(id: string, version: number): Observable<void> {
    return this.http
      .delete(`/api/activities/${enc(id)}`, {
        params: { version },
        context: callerShowsErrors(),
      })
      .pipe(map(() => undefined));
  }

  /** Uploads one file as multipart field `file`, reporting progress. */
  upload(activityId: string, file: File): Observable<UploadEvent> {
    const url = `/api/activities/${enc(activityId)}/attachments`;
    return uploadWithProgress(this.http, 'POST', url, file, attachmentSchema).pipe(
      map((e) => (e.kind === 'done' ? { kind: 'done', attachment: e.body } : e)),
    );
  }

  deleteAttachment(id: string): Observable<void> {
    return this.http
      .delete(`/api/activities/attachments/${enc(id)}`, { context: callerShowsErrors() })
      .pipe(map(() => undefined));
  }

  /** Where the browser downloads an attachment under its name. */
  attachmentUrl(id: string): string {
    return `/api/activities/attachments/${enc(id)}`;
  }
}
