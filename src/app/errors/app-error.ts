import { HttpErrorResponse } from '@angular/common/http';
import type { ApiErrorDetail } from '../../../shared/schemas/common';

/** Shown when the browser could not reach the server at all. */
export const NETWORK_MESSAGE =
  "Trayplan can't reach the server. Check your connection, then try again.";
/** Shown when the server failed without saying why. */
export const UNKNOWN_MESSAGE = 'Something went wrong on our side. Try again in a moment.';
/** Shown when a response does not have the shape the client expects. */
export const UNEXPECTED_RESPONSE_MESSAGE =
  'The server sent an answer Trayplan did not understand. Reload the page and try again.';

/**
 * The one shape every failure takes in the client, whatever went wrong: an HTTP error with the
 * API's `{ error: { code, message, details } }` body, a network failure (status 0), or a response
 * that failed its zod schema.
 */
export class AppError extends Error {
  override readonly name = 'AppError';

  constructor(
    /** HTTP status; 0 when the server was not reached or the answer could not be read. */
    readonly status: number,
    /** Machine-readable code, e.g. `invalid-credentials`, `network`, `unexpected-response`. */
    readonly code: string,
    message: string,
    /** Problems with single fields, each with the dotted path of its field. */
    readonly details: readonly ApiErrorDetail[] = [],
    /** Seconds to wait before trying again (from `Retry-After`), or null. */
    readonly retryAfterSeconds: number | null = null,
    /** For a 409 on a stale edit: the record as it is now. */
    readonly current: unknown = undefined,
  ) {
    super(message);
  }
}

interface ErrorBodyLike {
  error?: { code?: unknown; message?: unknown; details?: unknown; current?: unknown };
}

/** Turns an HttpClient failure into an AppError. */
export function toAppError(response: HttpErrorResponse, now: Date = new Date()): AppError {
  const body = errorBody(response.error);
  // A 504 without the server's error body was never answered by Trayplan: the service worker
  // says so when its fetch fails offline, and a proxy when the app does not answer in time.
  if (response.status === 0 || (response.status === 504 && !body?.error)) {
    return new AppError(0, 'network', NETWORK_MESSAGE);
  }
  const error = body?.error;
  const code = typeof error?.code === 'string' ? error.code : `http-${response.status}`;
  const message =
    typeof error?.message === 'string' && error.message.trim() !== ''
      ? error.message
      : fallbackMessage(response.status);
  const details = Array.isArray(error?.details) ? error.details.filter(isDetail) : [];
  const retryAfter = parseRetryAfter(response.headers?.get('Retry-After') ?? null, now);
  return new AppError(response.status, code, message, details, retryAfter, error?.current);
}

/** The error body; requests made with `responseType: 'text'` get it as unparsed JSON text. */
function errorBody(raw: unknown): ErrorBodyLike | null {
  if (typeof raw === 'string') {
    try {
      return errorBody(JSON.parse(raw));
    } catch {
      return null;
    }
  }
  return typeof raw === 'object' && raw !== null ? (raw as ErrorBodyLike) : null;
}

function isDetail(value: unknown): value is ApiErrorDetail {
  const d = value as ApiErrorDetail | null;
  return typeof d === 'object' && d !== null && typeof d.message === 'string';
}

function fallbackMessage(status: number): string {
  if (status === 401) return 'Sign in to continue.';
  if (status === 403) return "You don't have access to that.";
  if (status === 404) return "That page or record doesn't exist (any more).";
  if (status === 413) return 'That file is too large.';
  if (status === 429) return 'Too many requests. Wait a little, then try again.';
  return UNKNOWN_MESSAGE;
}

/**
 * Reads a `Retry-After` header: either delay-seconds or an HTTP-date (RFC 9110 §10.2.3).
 * Returns whole seconds from `now`, never negative, or null when absent or unreadable.
 */
export function parseRetryAfter(value: string | null, now: Date = new Date()): number | null {
  if (value === null) return null;
  const text = value.trim();
  if (/^\d+$/.test(text)) return Number.parseInt(text, 10);
  const date = Date.parse(text);
  if (Number.isNaN(date)) return null;
  return Math.max(0, Math.ceil((date - now.getTime()) / 1000));
}
