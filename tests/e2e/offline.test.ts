/**
 * Issue 13, offline: in Chromium the service worker (@angular/service-worker) registers and
 * controls the page; Today, an opened lesson and its downloaded pack, and a shared lesson opened
 * by its link, still open after the browser goes offline and the page is reloaded, each saying it
 * is a saved copy; the cached shell runs under the CSP without a violation; signing out leaves no
 * saved copy of the person's lessons behind.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import type { Browser, BrowserContext, Download, Page } from 'playwright-core';
import { baseUrl, launch, signInThroughPage } from '../support/browser.js';

const SAVED = 'You are offline. This is the copy saved in this browser on';
/** Generous: the machine running the suite may be busy (PDFs render on the server). */
const SLOW = { timeout: 60_000 };

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

/** A new context whose CSP reports (console "Refused to …" and violation events) are kept. */
async function watchedPage(): Promise<{ context: BrowserContext; page: Page; csp: string[] }> {
  const context = await browser.newContext({ acceptDownloads: true });
  const page = await context.newPage();
  const csp: string[] = [];
  page.on('console', (m) => {
    if (/Content Security Policy|Refused to/i.test(m.text())) csp.push(m.text());
  });
  // CSP Level 3 §5.3: every violation fires a securitypolicyviolation event at the document.
  await context.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) =>
      console.error(`Refused to load (CSP ${e.effectiveDirective}): ${e.blockedURI}`),
    );
  });
  return { context, page, csp };
}

/**
 * Waits until the service worker controls the page (it claims its clients once active) and has
 * saved every file of its prefetched groups (ngsw.json), which it does in the background after
 * taking control: only then does the shell open offline.
 */
async function controlled(page: Page): Promise<void> {
  await page.evaluate(() => navigator.serviceWorker.ready);
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, null, SLOW);
  const deadline = Date.now() + SLOW.timeout;
  for (;;) {
    const missing = await page.evaluate(async () => {
      // ngsw-bypass: asked of the server itself, not of the worker.
      const manifest = (await (await fetch('/ngsw.json?ngsw-bypass=1')).json()) as {
        assetGroups: { installMode: string; urls: string[] }[];
      };
      const saved = new Set<string>();
      for (const name of await caches.keys()) {
        for (const req of await (await caches.open(name)).keys()) {
          saved.add(new URL(req.url).pathname);
        }
      }
      return manifest.assetGroups
        .filter((g) => g.installMode === 'prefetch')
        .flatMap((g) => g.urls)
        .filter((url) => !saved.has(url));
    });
    if (missing.length === 0) return;
    assert.ok(Date.now() < deadline, `the worker never saved ${missing.join(', ')}`);
    await page.waitForTimeout(500);
  }
}

/** The first bytes of a download (ISO 32000-1 §7.5.2: a PDF file begins with "%PDF-"). */
async function head(download: Download): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of await download.createReadStream()) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).subarray(0, 5).toString('latin1');
}

/** Clicks `button` and answers the file it downloads. */
async function downloadBy(page: Page, click: () => Promise<void>): Promise<Download> {
  const [download] = await Promise.all([page.waitForEvent('download', SLOW), click()]);
  return download;
}

describe('offline (service worker)', () => {
  it('keeps Today, an opened lesson and its pack after going offline, under the CSP', async () => {
    const { context, page, csp } = await watchedPage();
    await signInThroughPage(page, 'relief@kestrel-ridge.example');
    await page.getByRole('heading', { name: 'Today', level: 1 }).waitFor();
    await controlled(page);
    assert.equal(await page.evaluate(() => !!navigator.serviceWorker.controller), true);

    // One lesson of the relief teacher's, opened and its pack downloaded once while online.
    await page.goto(`${baseUrl()}/relief`);
    await page.getByRole('link', { name: 'Open lesson' }).first().click();
    await page.waitForURL(/\/lessons\/[^/]+$/);
    const title = (await page.getByRole('heading', { level: 1 }).innerText()).trim();
    const lessonUrl = page.url();
    await page.locator('app-pull-list').first().waitFor(SLOW);
    const pack = page.getByRole('button', { name: 'Lesson pack' });
    assert.equal(await head(await downloadBy(page, () => pack.click())), '%PDF-');
    assert.equal(await page.getByText(SAVED).count(), 0, 'online, the page is live');

    await context.setOffline(true);
    await page.reload();
    await page.getByRole('heading', { name: title, level: 1 }).waitFor(SLOW);
    assert.equal(page.url(), lessonUrl);
    await page.getByRole('status').filter({ hasText: SAVED }).waitFor();
    await page.locator('app-pull-list').first().waitFor();
    const offlinePack = await downloadBy(page, () => pack.click());
    assert.equal(await head(offlinePack), '%PDF-');
    assert.match(offlinePack.suggestedFilename(), /\.pdf$/);

    // Today opens offline too, from the cached shell and the day this browser saved.
    await page.goto(`${baseUrl()}/today`);
    await page.getByRole('heading', { name: 'Today', level: 1 }).waitFor(SLOW);
    await page.getByRole('status').filter({ hasText: SAVED }).waitFor();
    assert.equal(await page.evaluate(() => !!navigator.serviceWorker.controller), true);
    assert.deepEqual(csp, []);
    await context.close();
  });

  it('keeps a shared lesson and its pack, opened by its link without an account', async () => {
    // A teacher shares one of their lessons (API.md: POST /api/lessons/:id/share-links).
    const teacher = await browser.newContext();
    const tp = await teacher.newPage();
    await signInThroughPage(tp, 'teacher@kestrel-ridge.example');
    const link = await tp.evaluate(async () => {
      const csrf = decodeURIComponent(/XSRF-TOKEN=([^;]+)/.exec(document.cookie)![1]!);
      const mine = (await (await fetch('/api/units?scope=mine')).json()) as {
        units: { id: string }[];
      };
      const unit = (await (await fetch(`/api/units/${mine.units[0]!.id}`)).json()) as {
        lessons: { id: string }[];
      };
      const id = unit.lessons[0]!.id;
      const res = await fetch(`/api/lessons/${id}/share-links`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', 'X-XSRF-TOKEN': csrf },
        body: '{}',
      });
      return { status: res.status, body: (await res.json()) as { url: string } };
    });
    assert.equal(link.status, 201);
    await teacher.close();
    const path = new URL(link.body.url).pathname;

    const { context, page, csp } = await watchedPage();
    await page.goto(`${baseUrl()}${path}`);
    const title = page.getByRole('heading', { level: 1 });
    await title.waitFor(SLOW);
    const name = (await title.innerText()).trim();
    await controlled(page);
    const download = page.getByRole('link', { name: 'Download the lesson pack (PDF)' });
    assert.equal(await head(await downloadBy(page, () => download.click())), '%PDF-');

    await context.setOffline(true);
    await page.reload();
    await page.getByRole('heading', { name, level: 1 }).waitFor(SLOW);
    await page.getByRole('status').filter({ hasText: SAVED }).waitFor();
    assert.equal(await head(await downloadBy(page, () => download.click())), '%PDF-');
    assert.deepEqual(csp, []);
    await context.close();
  });

  it("leaves none of the person's lessons in the browser after sign-out", async () => {
    const { context, page } = await watchedPage();
    await signInThroughPage(page, 'relief@kestrel-ridge.example');
    await controlled(page);
    await page.goto(`${baseUrl()}/relief`);
    await page.getByRole('link', { name: 'Open lesson' }).first().click();
    await page.waitForURL(/\/lessons\/[^/]+$/);
    const title = (await page.getByRole('heading', { level: 1 }).innerText()).trim();
    const lessonUrl = page.url();
    await page.locator('app-pull-list').first().waitFor(SLOW);
    const cachedLessons = () =>
      page.evaluate(async () => {
        const urls: string[] = [];
        for (const name of await caches.keys()) {
          for (const req of await (await caches.open(name)).keys()) {
            if (new URL(req.url).pathname.startsWith('/api/')) urls.push(req.url);
          }
        }
        return urls;
      });
    assert.ok((await cachedLessons()).some((u) => u.includes('/api/lessons/')));
    assert.ok(await page.evaluate(() => localStorage.getItem('trayplan.saved.relief.today')));

    await page.locator('.user-button').click();
    // With a worker removed, sign-out loads the sign-in page afresh (a new, empty worker).
    const freshLoad = page.waitForEvent('load', SLOW);
    await page.getByRole('menuitem', { name: /Sign out/ }).click();
    await freshLoad;
    await page.getByRole('button', { name: 'Sign in' }).waitFor(SLOW);
    assert.deepEqual(
      (await cachedLessons()).filter((u) => !u.endsWith('/api/auth/session')),
      [],
    );
    const stored = await page.evaluate(() =>
      Object.keys(localStorage).filter((k) => k.startsWith('trayplan.saved.')),
    );
    assert.deepEqual(stored, []);

    // The next person gets a new worker; offline, the lesson's address opens the sign-in page
    // from its shell, with nothing of the lesson.
    await controlled(page);
    await context.setOffline(true);
    await page.goto(lessonUrl);
    await page.getByRole('button', { name: 'Sign in' }).waitFor(SLOW);
    assert.equal(await page.getByRole('heading', { name: title, level: 1 }).count(), 0);
    assert.equal(await page.getByText(title).count(), 0);
    assert.deepEqual(
      (await cachedLessons()).filter((u) => !u.endsWith('/api/auth/session')),
      [],
    );
    await context.close();
  });
});
