import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, retry, timer } from 'rxjs';
import {
  packAwayResultSchema,
  trayBoardSchema,
  trayRevokeResultSchema,
  type PackAwayCreate,
  type TrayBoard,
} from '../../../shared/schemas/trays';
import { parseWith } from '../errors/parse';

/** Waits before opening a dropped stream again: 1 s, 2 s, 4 s … at most 30 s. */
function backoff(attempt: number): number {
  return Math.min(30_000, 1000 * 2 ** Math.min(attempt - 1, 5));
}

/** A lesson's trays for its teachers: the board, its live stream, revoking codes, pack-away. */
@Injectable({ providedIn: 'root' })
export class TrayBoardApi {
  private readonly http = inject(HttpClient);

  /**
   * The board, live: every event of `GET /api/lessons/:id/trays/events` is the whole board, so a
   * stream opened again after a drop catches up with its first event. Completes never; errors
   * are retried with a growing wait.
   */
  live(lessonId: string): Observable<TrayBoard> {
    return new Observable<TrayBoard>((subscriber) => {
      // ngsw-bypass: the service worker would wait for this endless stream to end before
      // answering (it keeps /api/lessons/** reads for offline use); a live board is never saved.
      const source = new EventSource(
        `/api/lessons/${encodeURIComponent(lessonId)}/trays/events?ngsw-bypass=1`,
      );
      source.addEventListener('trays', (event) => {
        const parsed = trayBoardSchema.safeParse(JSON.parse((event as MessageEvent<string>).data));
        if (parsed.success) subscriber.next(parsed.data);
      });
      source.onerror = () => {
        // The browser retries by itself while CONNECTING; a CLOSED stream (e.g. a 401) is ours.
        if (source.readyState === EventSource.CLOSED) subscriber.error(new Error('stream closed'));
      };
      return () => source.close();
    }).pipe(retry({ delay: (_err, attempt) => timer(backoff(attempt)), resetOnSuccess: true }));
  }

  /** The board once (a lesson on another day: nothing moves on its trays now). */
  board(lessonId: string): Observable<TrayBoard> {
    return this.http
      .get(`/api/lessons/${encodeURIComponent(lessonId)}/trays`)
      .pipe(parseWith(trayBoardSchema));
  }

  revoke(lessonId: string): Observable<{ revoked: number }> {
    return this.http
      .post(`/api/lessons/${encodeURIComponent(lessonId)}/trays/revoke`, {})
      .pipe(parseWith(trayRevokeResultSchema));
  }

  packAway(lessonId: string, body: PackAwayCreate) {
    return this.http
      .post(`/api/lessons/${encodeURIComponent(lessonId)}/pack-away`, body)
      .pipe(parseWith(packAwayResultSchema));
  }
}
