import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { parseWith } from '../errors/parse';
import {
  shareLinkCreatedSchema,
  shareLinkListSchema,
  type ShareLink,
  type ShareLinkCreate,
  type ShareLinkCreated,
} from '../../../shared/schemas/sharing';

/** A lesson's share links: make, list, withdraw (`/api/lessons/:id/share-links`). */
@Injectable({ providedIn: 'root' })
export class ShareLinksApi {
  private readonly http = inject(HttpClient);

  list(lessonId: string): Observable<{ links: ShareLink[] }> {
    return this.http
      .get(`/api/lessons/${encodeURIComponent(lessonId)}/share-links`)
      .pipe(parseWith(shareLinkListSchema));
  }

  create(lessonId: string, body: ShareLinkCreate): Observable<ShareLinkCreated> {
    return this.http
      .post(`/api/lessons/${encodeURIComponent(lessonId)}/share-links`, body)
      .pipe(parseWith(shareLinkCreatedSchema));
  }

  revoke(linkId: string): Observable<unknown> {
    return this.http.delete(`/api/share-links/${encodeURIComponent(linkId)}`);
  }
}
