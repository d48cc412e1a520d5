import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import {
  unitListSchema,
  unitSchema,
  type Unit,
  type UnitCreate,
  type UnitStatus,
  type UnitSummary,
} from '../../../shared/schemas/units';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** The filters of the units tables (`GET /api/units`). */
export interface UnitFilters {
  scope: 'mine' | 'library';
  yearLevel: number | null;
  term: number | null;
  status: UnitStatus | null;
  q: string;
}

/** Units (`/api/units`). */
@Injectable({ providedIn: 'root' })
export class UnitsApi {
  private readonly http = inject(HttpClient);

  list(filters: UnitFilters): Observable<UnitSummary[]> {
    let params = new HttpParams().set('scope', filters.scope);
    if (filters.yearLevel !== null) params = params.set('yearLevel', filters.yearLevel);
    if (filters.term !== null) params = params.set('term', filters.term);
    if (filters.status !== null) params = params.set('status', filters.status);
    if (filters.q.trim()) params = params.set('q', filters.q.trim());
    return this.http.get('/api/units', { params }).pipe(
      parseWith(unitListSchema),
      map((body) => body.units),
    );
  }

  get(id: string): Observable<Unit> {
    return this.http.get(`/api/units/${encodeURIComponent(id)}`).pipe(parseWith(unitSchema));
  }

  /** The form shows a 400's field errors under its fields. */
  create(unit: UnitCreate): Observable<Unit> {
    return this.http
      .post('/api/units', unit, { context: callerShowsErrors() })
      .pipe(parseWith(unitSchema));
  }
}
