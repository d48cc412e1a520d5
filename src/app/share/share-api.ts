import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { parseWith } from '../errors/parse';
import { callerShowsErrors } from '../errors/error-context';
import { sharedLessonSchema, type SharedLesson } from '../../../shared/schemas/sharing';
import { withSavedCopy, type MaybeSaved } from '../offline/saved-copy';

/** What a share link opens (`/api/share/:token…`): no account, the token is the key. */
@Injectable({ providedIn: 'root' })
export class ShareApi {
  private readonly http = inject(HttpClient);

  /** The shared lesson, or this browser's saved copy of it when offline. */
  lesson(token: string): Observable<MaybeSaved<SharedLesson>> {
    const read = this.http
      .get(`/api/share/${encodeURIComponent(token)}`, { context: callerShowsErrors() })
      .pipe(parseWith(sharedLessonSchema));
    return withSavedCopy(`share.${token}`, read);
  }

  packUrl(token: string): string {
    return `/api/share/${encodeURIComponent(token)}/pack.pdf`;
  }

  attachmentUrl(token: string, attachmentId: string): string {
    return `/api/share/${encodeURIComponent(token)}/attachments/${encodeURIComponent(attachmentId)}`;
  }
}
