import type { ErrorRequestHandler, Request, RequestHandler } from 'express';
import { z, type ZodType } from 'zod';
import type { ApiErrorDetail } from '../shared/schemas/common.js';
import { isDatabaseUnavailable, OUTAGE_RETRY_SECONDS } from './db/unavailable.js';

/** An error with an HTTP status that the error middleware answers in the API's one shape. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: ApiErrorDetail[],
    readonly extra?: { current?: unknown; headers?: Record<string, string> },
  ) {
    super(message);
  }
}

export const notFound = (what = 'That record') =>
  new HttpError(404, 'not-found', `${what} was not found.`);
export const forbidden = (message = 'Your role does not allow this.') =>
  new HttpError(403, 'forbidden', message);

/** Turns zod issues into the API's details list. */
export function issuesToDetails(issues: z.core.$ZodIssue[]): ApiErrorDetail[] {
  return issues.map((issue) => ({
    path: issue.path.map(String).join('.'),
    message: issue.message,
  }));
}

/** Parses with a zod schema; a failure is a 400 listing every issue. */
export function parse<T extends ZodType>(schema: T, data: unknown): z.infer<T> {
  const result = schema.safeParse(data);
  if (!result.success) {
    throw new HttpError(
      400,
      'invalid-input',
      'Some fields need attention.',
      issuesToDetails(result.error.issues),
    );
  }
  return result.data;
}

/** Parses `req.params` and turns a malformed id into a 404 (an id that cannot exist). */
export function parseParams<T extends ZodType>(schema: T, req: Request): z.infer<T> {
  const result = schema.safeParse(req.params);
  if (!result.success) throw notFound();
  return result.data;
}

export const jsonNotFound: RequestHandler = (_req, res) => {
  res
    .status(404)
    .json({ error: { code: 'not-found', message: 'There is nothing at this address.' } });
};

let lastOutageLog = 0;
/** One line at most every 10 s while the database is down, not a stack per request. */
function logOutage(err: unknown): void {
  if (Date.now() - lastOutageLog < 10_000) return;
  lastOutageLog = Date.now();
  console.error('PostgreSQL is unreachable; answering 503:', (err as Error).message);
}

/** The last middleware: one error shape, never a stack trace. */
export const errorHandler: ErrorRequestHandler = (err, _req, res, next) => {
  // Once an answer has started (a client that went away mid-response), only Express can end it.
  if (res.headersSent) return next(err);
  if (err instanceof HttpError) {
    for (const [k, v] of Object.entries(err.extra?.headers ?? {})) res.setHeader(k, v);
    res.status(err.status).json({
      error: {
        code: err.code,
        message: err.message,
        ...(err.details ? { details: err.details } : {}),
        ...(err.extra?.current !== undefined ? { current: err.extra.current } : {}),
      },
    });
    return;
  }
  const status =
    typeof err?.status === 'number'
      ? err.status
      : typeof err?.statusCode === 'number'
        ? err.statusCode
        : 500;
  if (err?.type === 'entity.parse.failed') {
    res
      .status(400)
      .json({ error: { code: 'invalid-json', message: 'The request body is not valid JSON.' } });
    return;
  }
  if (err?.type === 'entity.too.large' || err?.code === 'LIMIT_FILE_SIZE') {
    res.status(413).json({ error: { code: 'too-large', message: 'The upload is too large.' } });
    return;
  }
  if (status >= 400 && status < 500) {
    res
      .status(status)
      .json({ error: { code: 'bad-request', message: 'The request could not be read.' } });
    return;
  }
  if (isDatabaseUnavailable(err)) {
    logOutage(err);
    res.setHeader('Retry-After', String(OUTAGE_RETRY_SECONDS));
    res.status(503).json({
      error: {
        code: 'database-unavailable',
        message:
          'Trayplan cannot reach its database just now. Nothing was changed; try again in a moment.',
      },
    });
    return;
  }
  console.error('Unexpected error:', err);
  res
    .status(500)
    .json({ error: { code: 'internal', message: 'Something went wrong on the server.' } });
};
