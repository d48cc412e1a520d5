/**
 * CSRF protection as API.md sets it: `GET /api/auth/csrf` puts a token in the session and in the
 * readable cookie `XSRF-TOKEN`; every request that changes something must echo it in
 * `X-XSRF-TOKEN` (Angular's HttpClient does so by itself).
 */
import type { RequestHandler, Response } from 'express';
import { randomBytes, timingSafeEqual } from 'node:crypto';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);
export const CSRF_COOKIE = 'XSRF-TOKEN';
export const CSRF_HEADER = 'x-xsrf-token';

/** Makes a fresh token, keeps it in the session and sends the cookie. */
export function issueCsrf(req: Express.Request, res: Response, secure: boolean): string {
  const token = randomBytes(32).toString('base64url');
  req.session.csrf = token;
  res.cookie(CSRF_COOKIE, token, { httpOnly: false, sameSite: 'lax', secure, path: '/' });
  return token;
}

function equal(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/** Refuses a changing request whose header does not match the session's token. */
export const csrfGuard: RequestHandler = (req, res, next) => {
  if (SAFE.has(req.method)) return next();
  const sent = req.get(CSRF_HEADER);
  const expected = req.session?.csrf;
  if (!sent || !expected || !equal(sent, expected)) {
    res.status(403).json({
      error: {
        code: 'csrf',
        message:
          'This page is out of date or the request did not come from Trayplan. Reload and try again.',
      },
    });
    return;
  }
  next();
};
