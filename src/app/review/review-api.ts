import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import {
  commentListSchema,
  commentSchema,
  coverageSchema,
  reviewQueueSchema,
  reviewSummarySchema,
  reviewUnitSchema,
  type Coverage,
  type QueueRow,
  type ReviewAction,
  type ReviewSummary,
  type ReviewUnit,
  type UnitComment,
} from '../../../shared/schemas/review';
import { unitSchema, type Unit } from '../../../shared/schemas/units';
import { frameworkListSchema, type Framework } from '../../../shared/schemas/outcomes';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';
import { downloadWithProgress, type DownloadEvent } from '../files/transfer';

/** The queue's filters (`GET /api/review/queue`). */
export interface QueueFilters {
  status: 'in-review' | 'changes-requested';
  yearLevel: number | null;
  term: number | null;
}

/** The matrix's choices (`GET /api/coverage`). */
export interface CoverageFilters {
  frameworkId: string;
  yearLevel: number | null;
  status: 'any' | 'endorsed';
}

const unitUrl = (id: string) => `/api/units/${encodeURIComponent(id)}`;

function coverageParams(f: CoverageFilters): HttpParams {
  let params = new HttpParams().set('frameworkId', f.frameworkId).set('status', f.status);
  if (f.yearLevel !== null) params = params.set('yearLevel', f.yearLevel);
  return params;
}

/** Review steps, comments, the queue, the lead's summary and coverage. */
@Injectable({ providedIn: 'root' })
export class ReviewApi {
  private readonly http = inject(HttpClient);

  queue(f: QueueFilters): Observable<QueueRow[]> {
    let params = new HttpParams().set('status', f.status);
    if (f.yearLevel !== null) params = params.set('yearLevel', f.yearLevel);
    if (f.term !== null) params = params.set('term', f.term);
    return this.http.get('/api/review/queue', { params }).pipe(
      parseWith(reviewQueueSchema),
      map((b) => b.units),
    );
  }

  summary(): Observable<ReviewSummary> {
    return this.http.get('/api/review/summary').pipe(parseWith(reviewSummarySchema));
  }

  unit(id: string): Observable<ReviewUnit> {
    return this.http
      .get(`/api/review/units/${encodeURIComponent(id)}`)
      .pipe(parseWith(reviewUnitSchema));
  }

  /** The caller shows a 409 itself (someone moved the unit on meanwhile). */
  step(id: string, action: ReviewAction, version: number, comment?: string): Observable<Unit> {
    return this.http
      .post(
        `${unitUrl(id)}/review`,
        { action, version, ...(comment ? { comment } : {}) },
        { context: callerShowsErrors() },
      )
      .pipe(parseWith(unitSchema));
  }

  comments(id: string): Observable<UnitComment[]> {
    return this.http.get(`${unitUrl(id)}/comments`).pipe(
      parseWith(commentListSchema),
      map((b) => b.comments),
    );
  }

  /** The form shows a 400 itself. */
  comment(id: string, body: string, lessonId: string | null): Observable<UnitComment> {
    return this.http
      .post(
        `${unitUrl(id)}/comments`,
        { body, ...(lessonId ? { lessonId } : {}) },
        { context: callerShowsErrors() },
      )
      .pipe(parseWith(commentSchema));
  }

  frameworks(): Observable<Framework[]> {
    return this.http.get('/api/outcomes/frameworks').pipe(
      parseWith(frameworkListSchema),
      map((b) => b.frameworks),
    );
  }

  coverage(f: CoverageFilters): Observable<Coverage> {
    return this.http
      .get('/api/coverage', { params: coverageParams(f) })
      .pipe(parseWith(coverageSchema));
  }

  /** The matrix as CSV or PDF, with progress; errors go to the interceptor's snack-bar. */
  coverageFile(f: CoverageFilters, kind: 'csv' | 'pdf'): Observable<DownloadEvent> {
    return downloadWithProgress(this.http, `/api/coverage.${kind}?${coverageParams(f).toString()}`);
  }
}
