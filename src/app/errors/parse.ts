import { map, type OperatorFunction } from 'rxjs';
import type { z } from 'zod';
import { AppError, UNEXPECTED_RESPONSE_MESSAGE } from './app-error';

/**
 * Parses each response with a zod schema from `shared/schemas`. A response of the wrong shape
 * becomes an `AppError` (`unexpected-response`), so callers handle one kind of failure.
 */
export function parseWith<S extends z.ZodType>(schema: S): OperatorFunction<unknown, z.output<S>> {
  return map((body) => {
    const result = schema.safeParse(body);
    if (!result.success) {
      console.warn('[trayplan] response failed its schema', result.error.issues);
      throw new AppError(0, 'unexpected-response', UNEXPECTED_RESPONSE_MESSAGE);
    }
    return result.data;
  });
}
