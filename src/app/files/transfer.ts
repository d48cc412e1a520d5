/**
 * File transfers with progress, shared by every screen that uploads (CSV imports, photos,
 * attachments) or downloads (lesson and unit packs, labels, calendar files).
 */
import { HttpClient, HttpEventType, type HttpEvent } from '@angular/common/http';
import { filter, map, type Observable } from 'rxjs';
import type { ZodType } from 'zod';
import { AppError, UNEXPECTED_RESPONSE_MESSAGE } from '../errors/app-error';
import { callerShowsErrors } from '../errors/error-context';

/** An upload's progress in percent (null when the size is unknown), then the parsed answer. */
export type UploadEvent<T> =
  { kind: 'progress'; percent: number | null } | { kind: 'done'; body: T };

/**
 * Sends `file` as the multipart field `file` with POST or PUT, reporting upload progress, and
 * parses the answer with `schema`. The caller shows the errors (413, 415, 422 …) itself.
 */
export function uploadWithProgress<T>(
  http: HttpClient,
  method: 'POST' | 'PUT',
  url: string,
  file: File,
  schema: ZodType<T>,
): Observable<UploadEvent<T>> {
  const form = new FormData();
  form.append('file', file, file.name);
  return http
    .request(method, url, {
      body: form,
      reportProgress: true,
      observe: 'events',
      context: callerShowsErrors(),
    })
    .pipe(
      filter(
        (e: HttpEvent<unknown>) =>
          e.type === HttpEventType.UploadProgress || e.type === HttpEventType.Response,
      ),
      map((e): UploadEvent<T> => {
        if (e.type === HttpEventType.UploadProgress) {
          return {
            kind: 'progress',
            percent: e.total ? Math.round((100 * e.loaded) / e.total) : null,
          };
        }
        const parsed = schema.safeParse(e.type === HttpEventType.Response ? e.body : undefined);
        if (!parsed.success)
          throw new AppError(0, 'unexpected-response', UNEXPECTED_RESPONSE_MESSAGE);
        return { kind: 'done', body: parsed.data };
      }),
    );
}

/** A download's progress (0–1, or null when the size is unknown) or its finished file. */
export type DownloadEvent =
  { kind: 'progress'; fraction: number | null } | { kind: 'done'; blob: Blob; name: string | null };

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
