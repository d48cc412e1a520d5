import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import {
  copySummarySchema,
  unitHistorySchema,
  upstreamSchema,
  type UnitCopy,
  type UnitEventRecord,
  type Upstream,
} from '../../../shared/schemas/reuse';
import { unitSchema } from '../../../shared/schemas/units';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The answer of a copy: the new unit, with how the plans changed for the new class. */
export const copiedUnitSchema = unitSchema.extend({ copySummary: copySummarySchema });
export type CopiedUnit = ReturnType<typeof copiedUnitSchema.parse>;

const unitUrl = (id: string) => `/api/units/${encodeURIComponent(id)}`;

/** Reuse (`/api/units/:id/copy`, `/history`, `/upstream`). */
@Injectable({ providedIn: 'root' })
export class ReuseApi {
  private readonly http = inject(HttpClient);

  /** The copy dialog shows a 400's field errors under its fields. */
  copy(id: string, body: UnitCopy): Observable<CopiedUnit> {
    return this.http
      .post(`${unitUrl(id)}/copy`, body, { context: callerShowsErrors() })
      .pipe(parseWith(copiedUnitSchema));
  }

  history(id: string): Observable<UnitEventRecord[]> {
    return this.http.get(`${unitUrl(id)}/history`).pipe(
      parseWith(unitHistorySchema),
      map((body) => body.events),
    );
  }

  /** A 404 (the original is gone or no longer shared) is shown by the caller, quietly. */
  upstream(id: string): Observable<Upstream> {
    return this.http
      .get(`${unitUrl(id)}/upstream`, { context: callerShowsErrors() })
      .pipe(parseWith(upstreamSchema));
  }
}
