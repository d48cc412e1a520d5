import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { lessonSchema, type Lesson, type LessonUpdate } from '../../../shared/schemas/lessons';
import { lessonPrepSchema, type LessonPrep } from '../../../shared/prep/plan-schema';
import { prepTicksSchema, type PrepTicks } from '../../../shared/schemas/prep-ticks';
import { downloadWithProgress, type DownloadEvent } from '../files/transfer';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The printables a lesson offers (`/api/lessons/:id/pack.pdf`, `/labels.pdf`, `/prep.ics`). */
export type Printable = 'pack.pdf' | 'labels.pdf' | 'prep.ics';

/** A lesson and its prep plan with the parts it names (`/api/lessons/:id`, `/prep`). */
@Injectable({ providedIn: 'root' })
export class LessonsApi {
  private readonly http = inject(HttpClient);

  lesson(id: string): Observable<Lesson> {
    return this.http.get(`/api/lessons/${encodeURIComponent(id)}`).pipe(parseWith(lessonSchema));
  }

  /**
   * The prep plan with each part's name, colour and compartment (shared `lessonPrepSchema`);
   * `quiet` for background refreshes, whose errors the caller ignores.
   */
  prep(id: string, quiet = false): Observable<LessonPrep> {
    return this.http
      .get(
        `/api/lessons/${encodeURIComponent(id)}/prep`,
        quiet ? { context: callerShowsErrors() } : {},
      )
      .pipe(parseWith(lessonPrepSchema));
  }

  /** Ticks (`done`) or clears a prep task for all the lesson's teachers; answers every tick. */
  setPrepTick(id: string, taskKey: string, done: boolean): Observable<PrepTicks> {
    return this.http
      .put(`/api/lessons/${encodeURIComponent(id)}/prep/ticks`, { taskKey, done })
      .pipe(parseWith(prepTicksSchema));
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
