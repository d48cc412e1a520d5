import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import type * as z from 'zod';
import { kitTypeResponseSchema, type Part } from '../../../shared/schemas/kits';
import { lessonSchema, type Lesson, type LessonUpdate } from '../../../shared/schemas/lessons';
import { lessonPrepSchema } from '../../../shared/prep/plan-schema';
import { downloadWithProgress, type DownloadEvent } from '../files/transfer';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/**
 * The prep answer (shared `lessonPrepSchema`: the plan and its parts' names). `partNames` is read
 * as optional so a plan without it still shows, its codes standing in for names.
 */
const prepAnswerSchema = lessonPrepSchema.partial({ partNames: true });
export type PrepAnswer = z.output<typeof prepAnswerSchema>;

/** The printables a lesson offers (`/api/lessons/:id/pack.pdf`, `/labels.pdf`, `/prep.ics`). */
export type Printable = 'pack.pdf' | 'labels.pdf' | 'prep.ics';

/** A lesson, its prep plan and its kit type's parts (`/api/lessons/:id`, `/prep`). */
@Injectable({ providedIn: 'root' })
export class LessonsApi {
  private readonly http = inject(HttpClient);

  lesson(id: string): Observable<Lesson> {
    return this.http.get(`/api/lessons/${encodeURIComponent(id)}`).pipe(parseWith(lessonSchema));
  }

  /** The prep plan; `quiet` for background refreshes, whose errors the caller ignores. */
  prep(id: string, quiet = false): Observable<PrepAnswer> {
    return this.http
      .get(
        `/api/lessons/${encodeURIComponent(id)}/prep`,
        quiet ? { context: callerShowsErrors() } : {},
      )
      .pipe(parseWith(prepAnswerSchema));
  }

  /** The parts list, for colours and compartments (the plan names its parts itself). */
  parts(kitTypeId: string): Observable<Part[]> {
    return this.http.get(`/api/kit-types/${encodeURIComponent(kitTypeId)}`).pipe(
      parseWith(kitTypeResponseSchema),
      map((body) => body.kitType.parts),
    );
  }

  /** The page shows a 409 (stale version) itself, with Reload and Re-apply. */
  update(id: string, change: LessonUpdate): Observable<Lesson> {
    return this.http
      .patch(`/api/lessons/${encodeURIComponent(id)}`, change, { context: callerShowsErrors() })
      .pipe(parseWith(lessonSchema));
  }

  /** Downloads a printable with progress; its errors go to the interceptor's snack-bar. */
  download(id: string, file: Printable): Observable<DownloadEvent> {
    return downloadWithProgress(this.http, `/api/lessons/${encodeURIComponent(id)}/${file}`);
  }
}
