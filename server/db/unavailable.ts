/**
 * Recognises "PostgreSQL cannot be reached" among errors, so the API can answer 503 with
 * Retry-After while the database is down (and recover by itself: the pool drops broken clients
 * and opens new ones once PostgreSQL answers again) instead of a 500.
 */

/** Seconds a client is asked to wait before trying again during an outage. */
export const OUTAGE_RETRY_SECONDS = 5;

const NETWORK_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'ENOTFOUND',
  'EAI_AGAIN',
]);

/** SQLSTATEs of a server going away or not accepting connections (PostgreSQL Appendix A). */
function isUnavailableSqlState(code: string): boolean {
  // Class 08: connection exception; 57P01–57P03: admin/crash shutdown, cannot connect now.
  return code.startsWith('08') || code === '57P01' || code === '57P02' || code === '57P03';
}

const MESSAGES = [
  'Connection terminated',
  'timeout exceeded when trying to connect',
  'Client has encountered a connection error',
  'Connection refused',
];

/** Whether the error (or one it wraps) says the database could not be reached. */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 5) return false;
  const e = err as { code?: unknown; message?: unknown; cause?: unknown; errors?: unknown };
  if (typeof e.code === 'string' && (NETWORK_CODES.has(e.code) || isUnavailableSqlState(e.code)))
    return true;
  if (typeof e.message === 'string' && MESSAGES.some((m) => (e.message as string).includes(m)))
    return true;
  if (Array.isArray(e.errors) && e.errors.some((x) => isDatabaseUnavailable(x, depth + 1)))
    return true;
  return isDatabaseUnavailable(e.cause, depth + 1);
}
