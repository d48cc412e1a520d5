/**
 * At sign-out, this browser forgets what it saved for the person: the service worker's caches
 * (shell, lessons, packs, the session answer), its registration, and the copies pages keep in
 * localStorage. On a shared device the next person then sees none of the previous person's
 * lessons, online or offline.
 */
import { SAVED_PREFIX } from './saved-copy';

/**
 * Deletes every saved copy. Resolves true when a service worker was removed: the page should
 * then load afresh (a full navigation), so the next person gets a new, empty worker.
 */
export async function forgetSavedCopies(): Promise<boolean> {
  forgetStoredCopies();
  let removed = false;
  try {
    // Unregister first: from then on no navigation is served by the old worker, and nothing
    // it still does can reach a cache name the new worker will use after we deleted it.
    const container = typeof navigator === 'undefined' ? undefined : navigator.serviceWorker;
    const registrations = container ? await container.getRegistrations() : [];
    for (const registration of registrations)
      removed = (await registration.unregister()) || removed;
    if (typeof caches !== 'undefined') {
      for (const name of await caches.keys()) await caches.delete(name);
    }
  } catch (error) {
    // A browser that refuses (private mode, storage turned off) kept nothing to forget.
    console.warn('[trayplan] could not clear the offline copies', error);
  }
  return removed;
}

/** Removes the pages' own saved copies (localStorage keys under the saved-copy prefix). */
export function forgetStoredCopies(): void {
  try {
    const keys: string[] = [];
    for (let i = 0; i < localStorage.length; i++) {
      const key = localStorage.key(i);
      if (key?.startsWith(SAVED_PREFIX)) keys.push(key);
    }
    for (const key of keys) localStorage.removeItem(key);
  } catch {
    // Storage turned off: nothing was kept.
  }
}

/** Whose saved copies this browser holds (under the prefix, so a sign-out forgets it too). */
const OWNER_KEY = SAVED_PREFIX + 'owner';

/**
 * Whether this browser holds saved copies of someone other than `userId`: a session that ran
 * out on a shared device, and the next person signed in without a sign-out.
 */
export function savedForSomeoneElse(userId: string): boolean {
  try {
    const owner = localStorage.getItem(OWNER_KEY);
    return owner !== null && owner !== userId;
  } catch {
    return false; // Storage turned off: nothing was kept.
  }
}

/** Notes whose saved copies the browser now keeps. */
export function markSavedFor(userId: string): void {
  try {
    localStorage.setItem(OWNER_KEY, userId);
  } catch {
    // A full storage only costs the check at the next sign-in.
  }
}
