/**
 * One browser, one sign-in per role: pages of any size reuse the session signed in once, and the
 * API is called with the same cookies (and the CSRF header Angular would send).
 */
import type { APIResponse, Browser, BrowserContext, Page } from 'playwright-core';
import { baseUrl, signInThroughPage } from './browser.js';

type StorageState = Awaited<ReturnType<BrowserContext['storageState']>>;

export class Sessions {
  private readonly states = new Map<string, StorageState>();

  constructor(private readonly browser: Browser) {}

  /** The signed-in state of `email`; the sign-in runs at 1280 px, where the navigation shows. */
  async state(email: string): Promise<StorageState> {
    let state = this.states.get(email);
    if (!state) {
      const context = await this.browser.newContext({ viewport: { width: 1280, height: 900 } });
      await signInThroughPage(await context.newPage(), email);
      state = await context.storageState();
      this.states.set(email, state);
      await context.close();
    }
    return state;
  }

  /**
   * A new page signed in as `email` (or signed out, for null) at the given size. `bypassCSP` lets
   * a test add a user style sheet (the page's own CSP does not govern the user's styles).
   */
  async page(email: string | null, width: number, height: number): Promise<Page> {
    const context = await this.browser.newContext({
      viewport: { width, height },
      bypassCSP: true,
      ...(email ? { storageState: await this.state(email) } : {}),
    });
    return context.newPage();
  }

  /** GET, POST and DELETE to the API as `email`. */
  async api(email: string) {
    const state = await this.state(email);
    const context = await this.browser.newContext({ storageState: state });
    const xsrf = decodeURIComponent(
      state.cookies.find((c) => c.name === 'XSRF-TOKEN')?.value ?? '',
    );
    return {
      get: (path: string): Promise<APIResponse> => context.request.get(`${baseUrl()}${path}`),
      post: (path: string, data: unknown): Promise<APIResponse> =>
        context.request.post(`${baseUrl()}${path}`, { data, headers: { 'X-XSRF-TOKEN': xsrf } }),
      delete: (path: string): Promise<APIResponse> =>
        context.request.delete(`${baseUrl()}${path}`, { headers: { 'X-XSRF-TOKEN': xsrf } }),
      close: () => context.close(),
    };
  }
}

/** The demo unit "Rescue Rovers" and its lesson "Drive straight…" (the one with shortfalls). */
export async function demoLesson(
  sessions: Sessions,
  email: string,
): Promise<{ unitId: string; lessonId: string }> {
  const http = await sessions.api(email);
  const list = (await (await http.get('/api/units?scope=mine')).json()) as {
    units: { id: string; title: string }[];
  };
  const unit = list.units.find((u) => u.title === 'Rescue Rovers');
  if (!unit) throw new Error('the demo teacher owns Rescue Rovers');
  const detail = (await (await http.get(`/api/units/${unit.id}`)).json()) as {
    lessons: { id: string; title: string }[];
  };
  const lesson = detail.lessons.find((l) => l.title.startsWith('Drive straight'));
  if (!lesson) throw new Error('Rescue Rovers has its "Drive straight" lesson');
  await http.close();
  return { unitId: unit.id, lessonId: lesson.id };
}

/** A copied unit's lessons, as the unit's read gives them. */
export interface CopiedLesson {
  id: string;
  title: string;
  startsAt: string;
}

/**
 * Copies the demo unit as `email` (titled `title`, its first lesson on `startDate`) so a test can
 * change it while the demo stays as it is; `deleteUnitCopy` removes it again.
 */
export async function copyDemoUnit(
  sessions: Sessions,
  email: string,
  unitId: string,
  title: string,
  startDate: string,
): Promise<{ unitId: string; lessons: CopiedLesson[] }> {
  const http = await sessions.api(email);
  const copied = await http.post(`/api/units/${unitId}/copy`, {
    title: `${title} ${Date.now().toString(36)}`,
    startDate,
  });
  if (copied.status() !== 201) throw new Error(`copy refused: ${await copied.text()}`);
  const id = ((await copied.json()) as { id: string }).id;
  const copy = (await (await http.get(`/api/units/${id}`)).json()) as { lessons: CopiedLesson[] };
  await http.close();
  return { unitId: id, lessons: copy.lessons };
}

/** Deletes a unit copied by `copyDemoUnit`, so later test files find the demo as it was. */
export async function deleteUnitCopy(
  sessions: Sessions,
  email: string,
  unitId: string,
): Promise<void> {
  const http = await sessions.api(email);
  const unit = (await (await http.get(`/api/units/${unitId}`)).json()) as { version: number };
  const gone = await http.delete(`/api/units/${unitId}?version=${unit.version}`);
  if (gone.status() !== 204) throw new Error(`delete refused: ${await gone.text()}`);
  await http.close();
}
