/**
 * Lesson day end to end: the teacher's copy of Rescue Rovers starts today; the tray labels' PDF
 * is rendered to pixels and its QR codes decoded (pdfjs-dist, jsQR); a phone-sized browser
 * (390 × 844, then a 320 px pass) opens the decoded address with no account and ticks a line
 * out; the teacher's lesson page, open in another browser context, shows it without reloading.
 * The 320 px screenshot of the tray page is written to tests/e2e/screens/ to be looked at.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { mkdir } from 'node:fs/promises';
import { DateTime } from 'luxon';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { baseUrl, launch, seriousViolations, signInThroughPage } from '../support/browser.js';
import { readLabelsPdf, SCHOOL_ZONE } from '../support/trays.js';

const SCREENS = new URL('./screens/', import.meta.url);
let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

/** The API as the signed-in page's own cookies and CSRF token send it. */
async function api(context: BrowserContext, page: Page) {
  const token = async () =>
    decodeURIComponent((await context.cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '');
  return {
    get: (path: string) => page.request.get(`${baseUrl()}${path}`),
    post: async (path: string, data: unknown) =>
      page.request.post(`${baseUrl()}${path}`, {
        data,
        headers: { 'X-XSRF-TOKEN': await token() },
      }),
  };
}

describe('lesson day on a phone and on the teacher’s screen', () => {
  it('a group opens its tray from the label’s QR code, ticks a line, and the board shows it live', async () => {
    // Both browsers keep the school's clock, so "today" is the lesson's day for the board.
    const teacherContext = await browser.newContext({ timezoneId: SCHOOL_ZONE });
    const teacher = await teacherContext.newPage();
    await signInThroughPage(teacher, 'teacher@kestrel-ridge.example');
    const http = await api(teacherContext, teacher);

    // A copy of Rescue Rovers whose first lesson is today (POST /api/units/:id/copy, API.md).
    const units = (await (await http.get('/api/units?scope=mine')).json()) as {
      units: { id: string; title: string }[];
    };
    const rovers = units.units.find((u) => u.title === 'Rescue Rovers');
    assert.ok(rovers, 'the demo teacher owns Rescue Rovers');
    const today = DateTime.now().setZone(SCHOOL_ZONE).toISODate()!;
    const copied = await http.post(`/api/units/${rovers.id}/copy`, {
      title: `Rescue Rovers today ${Date.now().toString(36)}`,
      startDate: today,
    });
    assert.equal(copied.status(), 201, await copied.text());
    const unit = (await (await http.get(`/api/units/${(await copied.json()).id}`)).json()) as {
      lessons: { id: string; startsAt: string }[];
    };
    const lesson = unit.lessons.find((l) => l.startsAt.startsWith(today));
    assert.ok(lesson, 'the copy’s first lesson is today');
    const prep = (await (await http.get(`/api/lessons/${lesson.id}/prep`)).json()) as {
      groups: { number: number; lines: { partCode: string; allocated: number }[] }[];
    };

    // The labels as printed: QR codes read back from the rendered PDF.
    const pdf = await http.get(`/api/lessons/${lesson.id}/labels.pdf`);
    assert.equal(pdf.status(), 200);
    const labels = await readLabelsPdf(new Uint8Array(await pdf.body()));
    const first = labels.find((l) => l.qr && /Group 1\b/.test(l.text));
    assert.ok(first?.qr, 'group 1’s label carries a readable QR code');
    assert.match(first.qr, new RegExp(`^${baseUrl()}/tray/[A-Za-z0-9_-]{22,}$`));

    // The teacher's lesson page with its live board, open before anyone ticks.
    await teacher.goto(`${baseUrl()}/lessons/${lesson.id}`);
    const card = teacher.locator('app-tray-board li.card').filter({ hasText: /^\s*Group 1\b/ });
    await card.waitFor();
    const lines = prep.groups[0]!.lines.filter((l) => l.allocated > 0).length;
    assert.match(await card.innerText(), new RegExp(`0 of ${lines} lines out`));

    // A phone, no account: the decoded address opens group 1's tray.
    const phoneContext = await browser.newContext({
      viewport: { width: 390, height: 844 },
      deviceScaleFactor: 2,
      isMobile: true,
      hasTouch: true,
      timezoneId: SCHOOL_ZONE,
    });
    const phone = await phoneContext.newPage();
    await phone.goto(first.qr);
    await phone.getByRole('heading', { level: 1, name: 'Group 1' }).waitFor();
    // The same quantities as the plan: every line with its allocated quantity.
    const shown = await phone.locator('li.line .qty').allInnerTexts();
    assert.deepEqual(
      shown.map((q) => Number(q.replace(/[^\d]/g, ''))),
      prep.groups[0]!.lines.filter((l) => l.allocated > 0).map((l) => l.allocated),
    );
    const out = phone.getByRole('button', { name: /^Out: / }).first();
    await out.tap();
    await phone.getByRole('status').filter({ hasText: 'Every tap is saved.' }).waitFor();
    assert.equal(await out.getAttribute('aria-pressed'), 'true');

    // The teacher's page shows it through the event stream, without a reload.
    const navigations: string[] = [];
    teacher.on('framenavigated', (f) => navigations.push(f.url()));
    await card.filter({ hasText: `1 of ${lines} lines out` }).waitFor({ timeout: 15_000 });
    assert.deepEqual(navigations, [], 'the teacher’s page was not reloaded');

    // 320 px: one column, nothing wider than the screen, touch targets of 44 px at least
    // (WCAG 2.2 SC 2.5.5 Target Size, enhanced: 44 × 44 CSS px).
    const narrowContext = await browser.newContext({
      viewport: { width: 320, height: 640 },
      isMobile: true,
      hasTouch: true,
      timezoneId: SCHOOL_ZONE,
    });
    const narrow = await narrowContext.newPage();
    await narrow.goto(first.qr);
    await narrow.getByRole('heading', { level: 1, name: 'Group 1' }).waitFor();
    await narrow.evaluate(() => document.fonts.ready);
    const width = await narrow.evaluate(() => document.documentElement.scrollWidth);
    assert.ok(width <= 320, `the tray page is ${width} px wide at 320 px`);
    const targets = await narrow
      .locator('li.line button')
      .evaluateAll((els) => els.map((e) => e.getBoundingClientRect().height));
    assert.ok(targets.length > 0 && targets.every((h) => h >= 44), `targets ${targets.join(',')}`);
    // The tick from the phone is there after a fresh load, and the cautions are shown.
    assert.equal(
      await narrow
        .getByRole('button', { name: /^Out: / })
        .first()
        .getAttribute('aria-pressed'),
      'true',
    );
    assert.match(await narrow.locator('main').innerText(), /choking/i);
    assert.deepEqual(
      (await seriousViolations(narrow)).map((v) => v.id),
      [],
      'axe on the tray page at 320 px',
    );
    await mkdir(SCREENS, { recursive: true });
    await narrow.screenshot({ path: new URL('tray-320.png', SCREENS).pathname, fullPage: true });
    await narrow.screenshot({ path: new URL('tray-320-top.png', SCREENS).pathname });
    await phone.screenshot({ path: new URL('tray-390.png', SCREENS).pathname });
    await teacher.screenshot({ path: new URL('lesson-board.png', SCREENS).pathname });

    await narrowContext.close();
    await phoneContext.close();
    await teacherContext.close();
  });
});
