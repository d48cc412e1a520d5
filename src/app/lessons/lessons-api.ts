import { HttpClient, HttpEventType, type HttpEvent } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { filter, map, type Observable } from 'rxjs';
import { kitTypeResponseSchema, type Part } from '../../../shared/schemas/kits';
import { lessonSchema, type Lesson, type LessonUpdate } from '../../../shared/schemas/lessons';
import type { PrepPlan } from '../../../shared/prep/index';
import { prepPlanSchema } from '../../../shared/prep/plan-schema';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** A download's progress (0–1, or null when the size is unknown) or its finished file. */
export type DownloadEvent =
  | { kind: 'progress'; fraction: number | null }
  | { kind: 'done'; blob: Blob; name: string | null };

/**
 * The file name a server gave in Content-Disposition (RFC 6266): `filename*` (RFC 8187, UTF-8)
 * when present, else `filename`; null when there is none.
 */
export function filenameFromDisposition(header: string | null): string | null {
  if (!header) return null;
  const star = /filename\*\s*=\s*UTF-8''([^;]+)/i.exec(header);
  if (star) {
    try {
      return decodeURIComponent(star[1]!.trim());
    } catch {
      // fall back to the plain parameter
    }
  }
  const plain = /filename\s*=\s*"([^"]*)"|filename\s*=\s*([^;]+)/i.exec(header);
  const name = (plain?.[1] ?? plain?.[2] ?? '').trim();
  return name || null;
}

/** Downloads `url` as a blob, reporting progress; errors go to the interceptor's snack-bar. */
export function downloadWithProgress(http: HttpClient, url: string): Observable<DownloadEvent> {
  return http.get(url, { responseType: 'blob', observe: 'events', reportProgress: true }).pipe(
    map((event: HttpEvent<Blob>): DownloadEvent | null => {
      if (event.type === HttpEventType.DownloadProgress) {
        return { kind: 'progress', fraction: event.total ? event.loaded / event.total : null };
      }
      if (event.type === HttpEventType.Response) {
        return {
          kind: 'done',
          blob: event.body ?? new Blob(),
          name: filenameFromDisposition(event.headers.get('Content-Disposition')),
        };
      }
      return null;
    }),
    filter((event): event is DownloadEvent => event !== null),
  );
}

/** Hands a downloaded file to the browser under its name. */
export function saveBlob(blob: Blob, name: string): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = name;
  link.click();
  setTimeout(() => URL.revokeObjectURL(url));
}

/** The printables a lesson offers; another engineer's routes serve them. */
export type Printable = 'pack.pdf' | 'labels.pdf' | 'prep.ics';

/** A lesson, its prep plan and its kit type's parts (`/api/lessons/:id`, `/prep`). */
@Injectable({ providedIn: 'root' })
export class LessonsApi {
  private readonly http = inject(HttpClient);

  lesson(id: string): Observable<Lesson> {
    return this.http.get(`/api/lessons/${encodeURIComponent(id)}`).pipe(parseWith(lessonSchema));
  }

  /** The prep plan; `quiet` for background refreshes, whose errors the caller ignores. */
  prep(id: string, quiet = false): Observable<PrepPlan> {
    return this.http
      .get(`/api/lessons/${encodeURIComponent(id)}/prep`, quiet ? { context: callerShowsErrors() } : {})
      .pipe(parseWith(prepPlanSchema));
  }

  /** The parts list, for names, colours and compartments (the plan only names part codes). */
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
