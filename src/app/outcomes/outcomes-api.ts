import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import {
  frameworkListSchema,
  frameworkSchema,
  outcomeImportResultSchema,
  outcomeListSchema,
  type Framework,
  type OutcomeImportResult,
  type Outcome,
} from '../../../shared/schemas/outcomes';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';
import { uploadWithProgress, type UploadEvent } from '../files/transfer';

/** What the outcomes browser asks for; blank parts are left out of the query. */
export interface OutcomeSearch {
  frameworkId: string;
  q: string;
  yearBand: string;
}

/** Outcomes frameworks and their outcomes (`/api/outcomes`). */
@Injectable({ providedIn: 'root' })
export class OutcomesApi {
  private readonly http = inject(HttpClient);

  frameworks(): Observable<Framework[]> {
    return this.http.get('/api/outcomes/frameworks').pipe(
      parseWith(frameworkListSchema),
      map((b) => b.frameworks),
    );
  }

  /** The dialog shows this request's errors (e.g. 409 `name-taken`) itself. */
  createFramework(name: string): Observable<Framework> {
    return this.http
      .post('/api/outcomes/frameworks', { name }, { context: callerShowsErrors() })
      .pipe(parseWith(frameworkSchema));
  }

  search(query: OutcomeSearch): Observable<{ outcomes: Outcome[]; truncated: boolean }> {
    const params: Record<string, string> = {};
    for (const [key, value] of Object.entries(query)) {
      if (value.trim() !== '') params[key] = value.trim();
    }
    return this.http.get('/api/outcomes', { params }).pipe(parseWith(outcomeListSchema));
  }

  /** Uploads an outcomes CSV as multipart field `file`, reporting upload progress. */
  importOutcomes(frameworkId: string, file: File): Observable<UploadEvent<OutcomeImportResult>> {
    const url = `/api/outcomes/frameworks/${encodeURIComponent(frameworkId)}/import`;
    return uploadWithProgress(this.http, 'POST', url, file, outcomeImportResultSchema);
  }
}
