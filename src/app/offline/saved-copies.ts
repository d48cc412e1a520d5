/**
 * Which answers on screen are copies the service worker saved, and from when.
 *
 * Every API read carries a fresh random tag in `X-Trayplan-Read`, which the server echoes on its
 * answer. An answer the worker takes from its cache (the network failed or took too long) still
 * carries the tag of the request that first fetched it, so a tag that differs from the one sent
 * marks a saved copy; its `Date` header (RFC 9110 §6.6.1, set by the server when it answered)
 * says from when. No clock of this browser is compared with the server's.
 */
import {
  HttpResponse,
  type HttpEvent,
  type HttpHandlerFn,
  type HttpInterceptorFn,
  type HttpRequest,
} from '@angular/common/http';
import { Injectable, computed, inject, signal, type Signal } from '@angular/core';
import { tap, type Observable } from 'rxjs';

/** The request header the server echoes (server/app.ts). */
export const READ_TAG_HEADER = 'X-Trayplan-Read';

/**
 * When each read URL last answered from a saved copy: ISO 8601, '' when the copy carries no date,
 * null when the answer was live.
 */
@Injectable({ providedIn: 'root' })
export class SavedCopies {
  private readonly answers = signal<ReadonlyMap<string, string | null>>(new Map());

  /** Notes how `url` was last answered: live (null) or a copy saved at `savedAt`. */
  note(url: string, savedAt: string | null): void {
    if (this.answers().has(url) && this.answers().get(url) === savedAt) return;
    this.answers.update((map) => new Map(map).set(url, savedAt));
  }

  /**
   * The oldest saved time among the last answers of `urls`, or null when every one of them was
   * live (or has not answered yet): what a page built from these reads shows is that old.
   */
  savedAt(urls: () => readonly string[]): Signal<string | null> {
    return computed(() => {
      const answers = this.answers();
      let oldest: string | null = null;
      for (const url of urls()) {
        const at = answers.get(url) ?? null;
        if (at === null) continue;
        // A copy without a date counts as the oldest: nothing says it is any newer.
        if (oldest === null || at === '' || (oldest !== '' && Date.parse(at) < Date.parse(oldest)))
          oldest = at;
      }
      return oldest;
    });
  }

  /** Forgets every note (sign-out). */
  clear(): void {
    this.answers.set(new Map());
  }
}

/** A random tag for one read (128 bits, hex). */
function readTag(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Tags every GET under /api and notes whether its answer was live or a saved copy. */
export const savedCopyInterceptor: HttpInterceptorFn = (
  request: HttpRequest<unknown>,
  next: HttpHandlerFn,
): Observable<HttpEvent<unknown>> => {
  if (request.method !== 'GET' || !request.url.startsWith('/api/')) return next(request);
  const copies = inject(SavedCopies);
  const tag = readTag();
  const url = request.urlWithParams;
  return next(request.clone({ setHeaders: { [READ_TAG_HEADER]: tag } })).pipe(
    tap((event) => {
      if (!(event instanceof HttpResponse)) return;
      const echoed = event.headers.get(READ_TAG_HEADER);
      if (echoed === null || echoed === tag) {
        copies.note(url, null);
        return;
      }
      const date = Date.parse(event.headers.get('Date') ?? '');
      copies.note(url, Number.isNaN(date) ? '' : new Date(date).toISOString());
    }),
  );
};
