/**
 * Saved copies for when the network is gone: every successful read of a page's data is kept in
 * this browser (localStorage), and when the server cannot be reached the last copy is shown
 * instead, with the time it was saved, so the page can say clearly that it is not live.
 */
import { catchError, map, of, throwError, type Observable } from 'rxjs';
import { AppError } from '../errors/app-error';

/** Where pages keep their saved copies in localStorage (every key starts so). */
export const SAVED_PREFIX = 'trayplan.saved.';

/** A page's data and, when it is a saved copy, when it was saved (ISO 8601). */
export interface MaybeSaved<T> {
  value: T;
  /** Null when the data is live from the server. */
  savedAt: string | null;
}

/** Whether a failure means the server was not reached (offline), not that it said no. */
function unreachable(error: unknown): boolean {
  return error instanceof AppError
    ? error.status === 0
    : (error as { status?: number })?.status === 0;
}

/**
 * Reads through `source`, keeping each answer under `key`; when the server cannot be reached,
 * answers the last kept copy (if any) with its time. Other errors pass through unchanged.
 */
export function withSavedCopy<T>(key: string, source: Observable<T>): Observable<MaybeSaved<T>> {
  return source.pipe(
    map((value) => {
      try {
        localStorage.setItem(
          SAVED_PREFIX + key,
          JSON.stringify({ savedAt: new Date().toISOString(), value }),
        );
      } catch {
        // A full or disabled storage only costs the offline copy, never the live page.
      }
      return { value, savedAt: null };
    }),
    catchError((error: unknown) => {
      if (!unreachable(error)) return throwError(() => error);
      const saved = readSaved<T>(key);
      return saved ? of(saved) : throwError(() => error);
    }),
  );
}

/** The copy kept under `key`, if any. */
export function readSaved<T>(key: string): MaybeSaved<T> | null {
  try {
    const text = localStorage.getItem(SAVED_PREFIX + key);
    if (!text) return null;
    const parsed = JSON.parse(text) as { savedAt: string; value: T };
    return { value: parsed.value, savedAt: parsed.savedAt };
  } catch {
    return null;
  }
}

/** `Tue 4 Aug, 8:15 am` in the browser's own clock (when this browser saved the copy). */
export function savedLabel(savedAt: string): string {
  return new Date(savedAt).toLocaleString('en-AU', {
    weekday: 'short',
    day: 'numeric',
    month: 'short',
    hour: 'numeric',
    minute: '2-digit',
  });
}
