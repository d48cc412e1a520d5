import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import {
  trayCodeAnswerSchema,
  trayLineSchema,
  trayViewSchema,
  type TrayLine,
  type TrayLineUpdate,
  type TrayView,
} from '../../../shared/schemas/trays';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** A group's tray without an account: the token in the address is the credential. */
@Injectable({ providedIn: 'root' })
export class TrayApi {
  private readonly http = inject(HttpClient);

  tray(token: string): Observable<TrayView> {
    return this.http
      .get(`/api/trays/${encodeURIComponent(token)}`, { context: callerShowsErrors() })
      .pipe(parseWith(trayViewSchema));
  }

  saveLine(token: string, partCode: string, change: TrayLineUpdate): Observable<TrayLine> {
    return this.http
      .put(
        `/api/trays/${encodeURIComponent(token)}/lines/${encodeURIComponent(partCode)}`,
        change,
        { context: callerShowsErrors() },
      )
      .pipe(parseWith(trayLineSchema));
  }

  tokenOfCode(code: string): Observable<{ token: string }> {
    return this.http
      .get(`/api/trays/by-code/${encodeURIComponent(code)}`, { context: callerShowsErrors() })
      .pipe(parseWith(trayCodeAnswerSchema));
  }
}
