import type { z } from 'zod';
import { AppError } from './app-error';

/**
 * The 409 codes of an edit made on a stale copy (API.md): a newer version, a changed order, or a
 * review step the unit's status no longer allows.
 */
export type ConflictCode = 'stale-version' | 'order-changed' | 'invalid-transition';

/** A refused edit: the record as the server has it now (null when the answer did not carry it). */
export interface StaleConflict<T> {
  code: ConflictCode;
  current: T | null;
}

/**
 * The one reading of a stale edit's 409 (`{ error: { code, message, current } }`) for every
 * screen: null when `error` is anything else, so the caller shows it as usual.
 */
export function staleConflict<S extends z.ZodType>(
  error: unknown,
  schema: S,
  codes: readonly ConflictCode[] = ['stale-version'],
): StaleConflict<z.output<S>> | null {
  if (!(error instanceof AppError) || error.status !== 409) return null;
  const code = codes.find((c) => c === error.code);
  if (!code) return null;
  const current = schema.safeParse(error.current);
  return { code, current: current.success ? current.data : null };
}

/** For screens that also reorder children: either code means "reload, then try again". */
export const ORDER_CONFLICTS: readonly ConflictCode[] = ['stale-version', 'order-changed'];

/** For review steps: a stale version, or a status someone else has moved on meanwhile. */
export const REVIEW_CONFLICTS: readonly ConflictCode[] = ['stale-version', 'invalid-transition'];
