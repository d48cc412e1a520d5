/**
 * Optimistic versions and ordered children. An edit names the version it read; the UPDATE only
 * matches that version, so of two people saving at once exactly one wins and the other hears
 * 409 with the record as it now is (RFC 9110 §15.5.10), never a silent overwrite.
 */
import { and, eq, sql, type SQL } from 'drizzle-orm';
import type { PgColumn, PgTable, PgUpdateSetSource } from 'drizzle-orm/pg-core';
import type { Tx } from './client.js';
import { z } from 'zod';
import { HttpError, parse } from '../http.js';
import { versionSchema } from '../../shared/schemas/units.js';

/** The 409 of a stale version, carrying the current record: the API's one code for it. */
export function stale(what: string, current: unknown, message?: string): HttpError {
  return new HttpError(
    409,
    'stale-version',
    message ??
      `Someone changed this ${what} since you loaded it. Reload to see their changes, then apply yours again.`,
    undefined,
    { current },
  );
}

type VersionedTable = PgTable & { version: PgColumn };

/**
 * The one versioned update: sets `set` and bumps `version` on the row(s) matching `where` whose
 * version is `version` (any version when it is undefined, for changes that carry none, like a
 * CSV import). Returns whether a row matched; when not, the caller answers `stale(...)` with the
 * record as it now is (or 404 if it is gone).
 */
export async function versionedUpdate<T extends VersionedTable>(
  tx: Tx,
  table: T,
  where: SQL | undefined,
  version: number | undefined,
  set: PgUpdateSetSource<T> = {},
): Promise<boolean> {
  const saved = await tx
    .update(table)
    .set({ ...set, version: sql`${table.version} + 1` } as PgUpdateSetSource<T>)
    .where(and(where, version === undefined ? undefined : eq(table.version, version)))
    .returning({ version: table.version });
  return saved.length > 0;
}

/** The 409 of a reorder whose list no longer matches the children (one was added or removed). */
export function staleOrder(what: string, children: string, current: unknown): HttpError {
  return new HttpError(
    409,
    'order-changed',
    `The ${children} of this ${what} changed since you loaded it. Reload and put them in order again.`,
    undefined,
    { current },
  );
}

/** Whether `ids` are exactly `current`, in any order (both are lists without repeats). */
export function sameMembers(ids: readonly string[], current: readonly string[]): boolean {
  const set = new Set(current);
  return ids.length === current.length && ids.every((id) => set.has(id));
}

/**
 * Sets `position` = 1…n in the order of `ids` with one UPDATE (a single statement, so the table
 * is never seen half-reordered even outside the transaction that calls this).
 */
export async function writeOrder(tx: Tx, table: PgTable, ids: readonly string[]): Promise<void> {
  if (ids.length === 0) return;
  const values = ids.map((id, i) => sql`(${id}::uuid, ${i + 1}::int)`);
  await tx.execute(sql`
    UPDATE ${table} AS t SET position = v.position
    FROM (VALUES ${sql.join(values, sql`, `)}) AS v(id, position)
    WHERE t.id = v.id`);
}

const deleteQuerySchema = z.object({
  version: z.preprocess(
    (v) => (v === '' ? undefined : v),
    z.coerce.number().pipe(versionSchema).optional(),
  ),
});

/**
 * The version a DELETE may name in its query (`?version=3`): when sent, a record changed since it
 * was read is not deleted (409). Optional because a DELETE has no body and API.md names none.
 */
export function deleteVersion(query: unknown): number | undefined {
  return parse(deleteQuerySchema, query).version;
}
