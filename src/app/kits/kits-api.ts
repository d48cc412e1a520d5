import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import * as z from 'zod';
import {
  kitTypeListSchema,
  kitTypeResponseSchema,
  partSchema,
  partsImportResultSchema,
  tubAuditListSchema,
  tubListSchema,
  tubResponseSchema,
  type KitType,
  type KitTypeCreate,
  type KitTypeSummary,
  type KitTypeUpdate,
  type Part,
  type Tub,
  type TubAudit,
  type TubAuditCreate,
  type TubCreate,
  type TubSummary,
  type TubUpdate,
} from '../../../shared/schemas/kits';
import { bookingsResponseSchema, type BookingsResponse } from '../../../shared/schemas/bookings';
import { schoolSettingsResponseSchema } from '../../../shared/schemas/school';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';
import { uploadWithProgress, type UploadEvent } from '../files/transfer';

/** One line of a kit type's replacement list (missing pieces summed over its tubs). */
export const replacementLineSchema = z.object({
  partCode: z.string(),
  name: z.string(),
  missing: z.int(),
  tubs: z.array(z.object({ label: z.string(), count: z.int() })),
});
export type ReplacementLine = z.infer<typeof replacementLineSchema>;
const replacementsSchema = z.object({ lines: z.array(replacementLineSchema) });

/** Booking conflicts and recharge gaps of the school over a date range. */
export const conflictsSchema = z.object({
  conflicts: z.array(
    z.object({ lessons: z.array(z.unknown()), tubs: z.array(z.string()), message: z.string() }),
  ),
  rechargeGaps: z.array(z.looseObject({ message: z.string() })),
});
export type Conflicts = z.infer<typeof conflictsSchema>;

/** The fields of a part the inline editor may change. */
export type PartChange = Partial<Omit<Part, 'id' | 'hasPhoto'>>;
/** A part added by hand: every field of a part but its id and photo. */
export type NewPart = Omit<Part, 'id' | 'hasPhoto'>;

/** Progress of a part photo upload, then the part as saved (with `hasPhoto`). */
export type PhotoProgress =
  { kind: 'progress'; percent: number | null } | { kind: 'done'; part: Part };
const photoResultSchema = z.object({ part: partSchema });

/** Kit types, parts lists, tubs, audits and the kit reports (`/api/kit-types`, `/api/tubs`). */
@Injectable({ providedIn: 'root' })
export class KitsApi {
  private readonly http = inject(HttpClient);

  list(): Observable<KitTypeSummary[]> {
    return this.http.get('/api/kit-types').pipe(
      parseWith(kitTypeListSchema),
      map((b) => b.kitTypes),
    );
  }

  /** The form shows this request's errors (e.g. 409 `name-taken`) itself. */
  create(body: KitTypeCreate): Observable<KitType> {
    return this.http.post('/api/kit-types', body, { context: callerShowsErrors() }).pipe(
      parseWith(kitTypeResponseSchema),
      map((b) => b.kitType),
    );
  }

  get(id: string): Observable<KitType> {
    return this.http.get(`/api/kit-types/${encodeURIComponent(id)}`).pipe(
      parseWith(kitTypeResponseSchema),
      map((b) => b.kitType),
    );
  }

  /** The dialog shows this request's errors (400, 409 `stale-version` or `name-taken`) itself. */
  update(id: string, body: KitTypeUpdate): Observable<KitType> {
    return this.http
      .patch(`/api/kit-types/${encodeURIComponent(id)}`, body, { context: callerShowsErrors() })
      .pipe(
        parseWith(kitTypeResponseSchema),
        map((b) => b.kitType),
      );
  }

  /** The confirmation shows a 409 (`in-use`: lessons use it) itself. */
  delete(id: string): Observable<void> {
    return this.http
      .delete(`/api/kit-types/${encodeURIComponent(id)}`, { context: callerShowsErrors() })
      .pipe(map(() => undefined));
  }

  /** The page shows a 409 (stale version) itself; other errors go to the snack-bar. */
  updatePart(id: string, partId: string, version: number, change: PartChange): Observable<KitType> {
    const url = `/api/kit-types/${encodeURIComponent(id)}/parts/${encodeURIComponent(partId)}`;
    return this.http.patch(url, { version, ...change }, { context: callerShowsErrors() }).pipe(
      parseWith(kitTypeResponseSchema),
      map((b) => b.kitType),
    );
  }

  /** Adds one part at the end of the list; the page shows a 409 (stale, code taken) itself. */
  addPart(id: string, version: number, part: NewPart): Observable<KitType> {
    const url = `/api/kit-types/${encodeURIComponent(id)}/parts`;
    return this.http.post(url, { version, part }, { context: callerShowsErrors() }).pipe(
      parseWith(kitTypeResponseSchema),
      map((b) => b.kitType),
    );
  }

  /** Removes one part; a 409 (in use by lessons, or stale) is shown by the asking dialog. */
  removePart(id: string, partId: string, version: number): Observable<KitType> {
    const url = `/api/kit-types/${encodeURIComponent(id)}/parts/${encodeURIComponent(partId)}`;
    return this.http.delete(url, { params: { version }, context: callerShowsErrors() }).pipe(
      parseWith(kitTypeResponseSchema),
      map((b) => b.kitType),
    );
  }

  /** Uploads a parts-list CSV as multipart field `file`, reporting upload progress. */
  importParts(id: string, file: File): Observable<UploadEvent<{ imported: number }>> {
    const url = `/api/kit-types/${encodeURIComponent(id)}/parts/import`;
    return uploadWithProgress(this.http, 'POST', url, file, partsImportResultSchema);
  }

  /** Where a part's photo is served (the `<img>` source). */
  photoUrl(id: string, code: string): string {
    return `/api/kit-types/${encodeURIComponent(id)}/parts/${encodeURIComponent(code)}/photo`;
  }

  /** Uploads a part's photo as multipart field `file`, reporting upload progress. */
  uploadPhoto(id: string, code: string, file: File): Observable<PhotoProgress> {
    return uploadWithProgress(
      this.http,
      'PUT',
      this.photoUrl(id, code),
      file,
      photoResultSchema,
    ).pipe(map((e) => (e.kind === 'done' ? { kind: 'done', part: e.body.part } : e)));
  }

  /** The photo cell shows this request's errors itself. */
  deletePhoto(id: string, code: string): Observable<void> {
    return this.http
      .delete(this.photoUrl(id, code), { context: callerShowsErrors() })
      .pipe(map(() => undefined));
  }

  /** Where the browser downloads the parts list as CSV. */
  partsCsvUrl(id: string): string {
    return `/api/kit-types/${encodeURIComponent(id)}/parts.csv`;
  }

  replacements(id: string): Observable<ReplacementLine[]> {
    return this.http.get(`/api/kit-types/${encodeURIComponent(id)}/replacements`).pipe(
      parseWith(replacementsSchema),
      map((b) => b.lines),
    );
  }

  replacementsCsvUrl(id: string): string {
    return `/api/kit-types/${encodeURIComponent(id)}/replacements.csv`;
  }

  tubs(kitTypeId: string): Observable<TubSummary[]> {
    return this.http.get('/api/tubs', { params: { kitTypeId } }).pipe(
      parseWith(tubListSchema),
      map((b) => b.tubs),
    );
  }

  tub(id: string): Observable<Tub> {
    return this.http.get(`/api/tubs/${encodeURIComponent(id)}`).pipe(
      parseWith(tubResponseSchema),
      map((b) => b.tub),
    );
  }

  /** The dialog shows this request's errors (400, 409 `label-taken`) itself. */
  createTub(body: TubCreate): Observable<Tub> {
    return this.http.post('/api/tubs', body, { context: callerShowsErrors() }).pipe(
      parseWith(tubResponseSchema),
      map((b) => b.tub),
    );
  }

  /** The dialog shows this request's errors (400, 409 `stale-version` or `label-taken`) itself. */
  updateTub(id: string, body: TubUpdate): Observable<Tub> {
    return this.http
      .patch(`/api/tubs/${encodeURIComponent(id)}`, body, { context: callerShowsErrors() })
      .pipe(
        parseWith(tubResponseSchema),
        map((b) => b.tub),
      );
  }

  /** The confirmation shows a 409 (`in-use`: lessons book the tub) itself. */
  deleteTub(id: string): Observable<void> {
    return this.http
      .delete(`/api/tubs/${encodeURIComponent(id)}`, { context: callerShowsErrors() })
      .pipe(map(() => undefined));
  }

  audits(tubId: string): Observable<TubAudit[]> {
    return this.http.get(`/api/tubs/${encodeURIComponent(tubId)}/audits`).pipe(
      parseWith(tubAuditListSchema),
      map((b) => b.audits),
    );
  }

  /** The audit form shows this request's errors itself; the dialog then reloads the tub. */
  createAudit(tubId: string, body: TubAuditCreate): Observable<void> {
    return this.http
      .post(`/api/tubs/${encodeURIComponent(tubId)}/audits`, body, {
        context: callerShowsErrors(),
      })
      .pipe(map(() => undefined));
  }

  conflicts(from: string, to: string): Observable<Conflicts> {
    return this.http
      .get('/api/conflicts', { params: { from, to } })
      .pipe(parseWith(conflictsSchema));
  }

  /** The school's tub bookings day by day over [from, to) (`to` is the day after the last). */
  bookings(from: string, to: string): Observable<BookingsResponse> {
    return this.http
      .get('/api/bookings', { params: { from, to } })
      .pipe(parseWith(bookingsResponseSchema));
  }

  /** The school's terms, for the default range of the conflicts. */
  terms(): Observable<{ name: string; startsOn: string; endsOn: string }[]> {
    return this.http.get('/api/school').pipe(
      parseWith(schoolSettingsResponseSchema),
      map((b) => b.school.terms),
    );
  }
}
