import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import * as z from 'zod';
import { reliefDaySchema, type ReliefDay } from '../../../shared/schemas/sharing';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';
import { downloadWithProgress, type DownloadEvent } from '../files/transfer';
import { withSavedCopy, type MaybeSaved } from '../offline/saved-copy';

export const reliefLessonSchema = z.object({
  id: z.string(),
  title: z.string(),
  startsAt: z.string(),
  endsAt: z.string(),
  room: z.string(),
  unitId: z.string(),
  unitTitle: z.string(),
  className: z.string(),
  reliefNotes: z.string(),
});
export type ReliefLesson = z.infer<typeof reliefLessonSchema>;
const listSchema = z.object({ lessons: z.array(reliefLessonSchema) });

/** The lessons assigned to the signed-in relief teacher (`/api/relief/lessons`, `/today`). */
@Injectable({ providedIn: 'root' })
export class ReliefApi {
  private readonly http = inject(HttpClient);

  lessons(): Observable<{ lessons: ReliefLesson[] }> {
    return this.http.get('/api/relief/lessons').pipe(parseWith(listSchema));
  }

  /**
   * Today's assigned lessons (`GET /api/relief/today`), or the copy this browser saved when the
   * server cannot be reached. The page shows a failure itself.
   */
  today(): Observable<MaybeSaved<ReliefDay>> {
    const read = this.http
      .get('/api/relief/today', { context: callerShowsErrors() })
      .pipe(parseWith(reliefDaySchema));
    return withSavedCopy('relief.today', read);
  }

  pack(lessonId: string): Observable<DownloadEvent> {
    return downloadWithProgress(this.http, `/api/lessons/${encodeURIComponent(lessonId)}/pack.pdf`);
  }
}
