/**
 * CSRF protection as API.md sets it: `GET /api/auth/csrf` sends the readable cookie `XSRF-TOKEN`;
 * every request that changes something must echo it in `X-XSRF-TOKEN` (Angular's HttpClient does
 * so by itself). OWASP CSRF Prevention Cheat Sheet, "Signed Double-Submit Cookie": the token is a
 * random value with an HMAC over it and the signed-in session's id, so nothing is stored (an
 * anonymous visit makes no session row) and a token planted from elsewhere or kept from before
 * sign-in is refused.
 */
import type { Request, RequestHandler, Response } from 'express';
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);
export const CSRF_COOKIE = 'XSRF-TOKEN';
export const CSRF_HEADER = 'x-xsrf-token';

/** What a token is bound to: the session id once signed in, nothing before. */
function binding(req: Request): string {
  return req.session?.userId ? req.sessionID : '';
}

function signature(secret: string, bound: string, nonce: string): string {
  return createHmac('sha256', secret).update(`csrf|${bound}|${nonce}`).digest('base64url');
}

/** Makes a fresh token for the request's session (or none) and sends the cookie. */
export function issueCsrf(req: Request, res: Response, secret: string, secure: boolean): string {
  const nonce = randomBytes(32).toString('base64url');
  const token = `${nonce}.${signature(secret, binding(req), nonce)}`;
  res.cookie(CSRF_COOKIE, token, { httpOnly: false, sameSite: 'lax', secure, path: '/' });
  return token;
}

function equal(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

function cookie(req: Request, name: string): string | undefined {
  for (const part of (req.headers.cookie ?? '').split(';')) {
    const at = part.indexOf('=');
    if (at > 0 && part.slice(0, at).trim() === name) {
      try {
        return decodeURIComponent(part.slice(at + 1).trim());
      } catch {
        return undefined;
      }
    }
  }
  return undefined;
}

/** Whether the header repeats the cookie and the cookie carries our signature for this session. */
function valid(req: Request, secret: string): boolean {
  const sent = req.get(CSRF_HEADER);
  const kept = cookie(req, CSRF_COOKIE);
  if (!sent || !kept || !equal(sent, kept)) return false;
  const [nonce, mac, extra] = sent.split('.');
  if (!nonce || !mac || extra !== undefined) return false;
  return equal(mac, signature(secret, binding(req), nonce));
}

/** Refuses a changing request without a valid token. */
export function csrfGuard(secret: string): RequestHandler {
  return (req, res, next) => {
    if (SAFE.has(req.method) || valid(req, secret)) return next();
    res.status(403).json({
      error: {
        code: 'csrf',
        message:
          'This page is out of date or the request did not come from Trayplan. Reload and try again.',
      },
    });
  };
}
