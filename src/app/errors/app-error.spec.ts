import { HttpErrorResponse, HttpHeaders } from '@angular/common/http';
import {
  AppError,
  NETWORK_MESSAGE,
  UNKNOWN_MESSAGE,
  parseRetryAfter,
  toAppError,
} from './app-error';

describe('AppError', () => {
  it('reads code, message and details from the API error body', () => {
    const error = toAppError(
      new HttpErrorResponse({
        status: 400,
        error: {
          error: {
            code: 'validation',
            message: 'Check the highlighted fields.',
            details: [{ path: 'email', message: 'Enter a valid e-mail address.' }],
          },
        },
      }),
    );
    expect(error).toEqual(jasmine.any(AppError));
    expect(error.status).toBe(400);
    expect(error.code).toBe('validation');
    expect(error.message).toBe('Check the highlighted fields.');
    expect(error.details).toEqual([{ path: 'email', message: 'Enter a valid e-mail address.' }]);
  });

  it('gives status 0 and a friendly message when the server was not reached', () => {
    const error = toAppError(
      new HttpErrorResponse({ status: 0, error: new ProgressEvent('error') }),
    );
    expect([error.status, error.code, error.message]).toEqual([0, 'network', NETWORK_MESSAGE]);
  });

  it("treats the service worker's bare 504 as not reached, but keeps a 504 the server words", () => {
    // RFC 9110 §15.6.5: 504 is a gateway's answer that the upstream server did not answer; the
    // Angular service worker gives a bodiless 504 when its own fetch fails offline.
    const bare = toAppError(new HttpErrorResponse({ status: 504, error: null }));
    expect([bare.status, bare.code, bare.message]).toEqual([0, 'network', NETWORK_MESSAGE]);
    const worded = toAppError(
      new HttpErrorResponse({
        status: 504,
        error: { error: { code: 'upstream', message: 'The mail server did not answer.' } },
      }),
    );
    expect([worded.status, worded.code]).toEqual([504, 'upstream']);
  });

  it('reads the body of a text request, which arrives as unparsed JSON', () => {
    const error = toAppError(
      new HttpErrorResponse({
        status: 400,
        error: JSON.stringify({ error: { code: 'token-invalid', message: 'Used link.' } }),
      }),
    );
    expect([error.code, error.message]).toEqual(['token-invalid', 'Used link.']);
  });

  it('falls back to a code from the status when the body is not the API shape', () => {
    const error = toAppError(
      new HttpErrorResponse({ status: 502, error: '<html>Bad gateway</html>' }),
    );
    expect([error.code, error.message]).toEqual(['http-502', UNKNOWN_MESSAGE]);
    expect(error.details).toEqual([]);
  });

  it('keeps Retry-After of a 429 (RFC 6585 §4: a 429 MAY include Retry-After)', () => {
    const error = toAppError(
      new HttpErrorResponse({
        status: 429,
        headers: new HttpHeaders({ 'Retry-After': '900' }),
        error: { error: { code: 'too-many-attempts', message: 'Slow down.' } },
      }),
    );
    expect(error.retryAfterSeconds).toBe(900);
  });
});

describe('parseRetryAfter', () => {
  it('reads delay-seconds (RFC 9110 §10.2.3 example: "Retry-After: 120")', () => {
    expect(parseRetryAfter('120')).toBe(120);
  });

  it('reads an HTTP-date (RFC 9110 §10.2.3 example: "Fri, 31 Dec 1999 23:59:59 GMT")', () => {
    const now = new Date(Date.UTC(1999, 11, 31, 23, 57, 59));
    expect(parseRetryAfter('Fri, 31 Dec 1999 23:59:59 GMT', now)).toBe(120);
  });

  it('never answers a negative wait, and null for nothing or nonsense', () => {
    const later = new Date(Date.UTC(2000, 0, 1));
    expect(parseRetryAfter('Fri, 31 Dec 1999 23:59:59 GMT', later)).toBe(0);
    expect(parseRetryAfter(null)).toBeNull();
    expect(parseRetryAfter('soon')).toBeNull();
  });
});
