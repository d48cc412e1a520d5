import {
  computed,
  untracked,
  type ResourceRef,
  type Signal,
  type ValueEqualityFn,
} from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { catchError, of, throwError, type Observable } from 'rxjs';
import { AppError } from '../errors/app-error';

/** How a read is made: `quiet` for a background refresh, whose failure nobody is shown. */
export interface ReadMode {
  quiet: boolean;
}

/** What a screen reads from the API, as signals. */
export interface ApiResource<T> {
  /** The last answer, or undefined while nothing has loaded (or the first load failed). */
  readonly value: Signal<T | undefined>;
  /** True while a load or reload is on its way. */
  readonly loading: Signal<boolean>;
  /** The message of a failed load, or null. */
  readonly error: Signal<string | null>;
  /** Loads again; a failure is shown like the first load's. */
  reload(): void;
  /** Loads again in the background: a failure keeps what is shown and tells nobody. */
  refresh(): void;
  /** Shows a record the screen already has (e.g. the answer of a save) without loading. */
  set(value: T): void;
}

export interface ApiResourceOptions<P, T> {
  /**
   * What to load; undefined while there is nothing to load yet. A changed value (compared with
   * `===`, so use ids or strings) loads again. Without it the read loads once.
   */
  params?: () => P | undefined;
  /** The API service's read (which parses the answer with its zod schema from shared/schemas). */
  load: (params: P, mode: ReadMode) => Observable<T>;
  /** When a reload's answer counts as unchanged, so the screen keeps what it shows. */
  equal?: ValueEqualityFn<T>;
}

/**
 * The one wrapper around Angular's resource APIs (`rxResource` is still experimental in 21, so
 * an API change touches this file only). Reads go through the API services, which keep the URLs
 * and the zod parse; the resource reloads when `params` change and on `reload()`/`refresh()`.
 */
export function apiResource<P, T>(options: ApiResourceOptions<P, T>): ApiResource<T> {
  let quiet = false;
  // A computed, so an unchanged value (e.g. the same id from a newer record) does not reload.
  const params = computed(options.params ?? (() => true as P));
  const resource: ResourceRef<T | undefined> = rxResource<T | undefined, P | undefined>({
    params,
    stream: ({ params }): Observable<T | undefined> => {
      const mode: ReadMode = { quiet };
      quiet = false;
      const shown: T | undefined = untracked(() =>
        resource.hasValue() ? resource.value() : undefined,
      );
      return options.load(params as P, mode).pipe(
        // A background refresh that fails keeps the answer shown.
        catchError((error: unknown) =>
          mode.quiet && shown !== undefined ? of(shown) : throwError(() => error),
        ),
      );
    },
    equal: options.equal
      ? (a, b) => a !== undefined && b !== undefined && options.equal!(a, b)
      : undefined,
  });
  return {
    value: computed(() => (resource.hasValue() ? resource.value() : undefined)),
    loading: resource.isLoading,
    error: computed(() => {
      if (resource.status() !== 'error') return null;
      const error = resource.error();
      return error instanceof AppError ? error.message : 'This page did not load.';
    }),
    reload: () => {
      quiet = false;
      resource.reload();
    },
    refresh: () => {
      quiet = true;
      if (!resource.reload()) quiet = false;
    },
    set: (value) => resource.set(value),
  };
}

/** Structural equality of parsed JSON answers (plain objects, arrays and primitives). */
export function sameAnswer(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  const keysA = Object.keys(a);
  const keysB = Object.keys(b);
  if (keysA.length !== keysB.length) return false;
  return keysA.every(
    (key) =>
      Object.prototype.hasOwnProperty.call(b, key) &&
      sameAnswer((a as Record<string, unknown>)[key], (b as Record<string, unknown>)[key]),
  );
}
