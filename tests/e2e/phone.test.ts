/**
 * Phone width (issue 9): at 390 × 844 the lesson page's pull lists, the kit page's tubs and the tub
 * dialog's stock and audit columns are stacked rows, every value inside the screen and after its
 * column's name, none in hidden sideways overflow (W3C WCAG 2.2 SC 1.4.10 Reflow; SC 1.3.1 Info
 * and Relationships for the names). One browser; the teacher signs in once.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import type { Browser, Page } from 'playwright-core';
import { baseUrl, launch } from '../support/browser.js';
import { demoLesson, Sessions } from '../support/sessions.js';

const TEACHER = 'teacher@kestrel-ridge.example';
const PHONE = { width: 390, height: 844 };
let browser: Browser;
let sessions: Sessions;

before(async () => {
  browser = await launch();
  sessions = new Sessions(browser);
});
after(async () => {
  await browser.close();
});

interface Cell {
  label: string;
  text: string;
  left: number;
  right: number;
  /** The name shown in front of the value (the cell's ::before), '' when none is shown. */
  shownName: string;
}

/** The cells of `selector` with a data-label: where they are drawn and the name shown. */
function cells(page: Page, selector: string): Promise<Cell[]> {
  return page.evaluate(
    (s) =>
      Array.from(document.querySelectorAll<HTMLElement>(`${s} [data-label]`)).map((td) => {
        const box = td.getBoundingClientRect();
        const before = getComputedStyle(td, '::before').content;
        return {
          label: td.dataset['label']!,
          text: (td.textContent ?? '').trim(),
          left: box.left,
          right: box.right,
          // content is the quoted string of attr(data-label), or "none".
          shownName: before === 'none' ? '' : before.replace(/^"|"$/g, ''),
        };
      }),
    selector,
  );
}

/** What is wrong with the cells at phone width: outside the screen, or not named. */
function problems(found: Cell[], width: number): string[] {
  return found.flatMap((c) => [
    ...(c.left < 0 || c.right > width
      ? [`${c.label} "${c.text}" drawn at ${Math.round(c.left)}–${Math.round(c.right)} px`]
      : []),
    ...(c.shownName === c.label ? [] : [`${c.label} "${c.text}" shown as "${c.shownName}"`]),
  ]);
}

/** Wrappers that would hide columns in sideways overflow (scrollWidth beyond their box). */
function overflowing(page: Page, selector: string): Promise<string[]> {
  return page.evaluate(
    (s) =>
      Array.from(document.querySelectorAll<HTMLElement>(s))
        .filter((e) => e.scrollWidth > e.clientWidth + 1)
        .map((e) => `${e.className}: ${e.scrollWidth} > ${e.clientWidth}`),
    selector,
  );
}

describe('SC 1.4.10 Reflow at phone width (390 px)', () => {
  it('lesson page: every pull list row shows its quantity and source, named, on screen', async () => {
    const { lessonId } = await demoLesson(sessions, TEACHER);
    const page = await sessions.page(TEACHER, PHONE.width, PHONE.height);
    await page.goto(`${baseUrl()}/lessons/${lessonId}`);
    await page.getByRole('heading', { name: 'Timeline' }).waitFor();
    // Groups 8 and 9 of the demo lesson are short: their rows say "N of M".
    await page
      .getByText(/Group 8 is short/)
      .first()
      .waitFor();
    await page.waitForLoadState('networkidle');

    assert.deepEqual(await overflowing(page, 'app-pull-list .table-wrap'), []);
    const found = await cells(page, 'app-pull-list');
    const quantities = found.filter((c) => c.label === 'Quantity');
    const sources = found.filter((c) => c.label === 'From');
    // Every group's list and the two trays: dozens of rows, each with both values.
    assert.ok(quantities.length > 20, `${quantities.length} quantities shown`);
    assert.equal(sources.length, quantities.length);
    assert.ok(
      quantities.some((c) => /^\d+ of \d+$/.test(c.text)),
      'a short line shows what it gets of what it needs',
    );
    assert.deepEqual(problems(found, PHONE.width), []);
    // The column headers stay for screen readers (SC 1.3.1), only out of sight.
    const headers = await page.locator('app-pull-list th', { hasText: 'Quantity' }).count();
    assert.ok(headers > 0, 'the Quantity header cells are still in the table');
    await page.context().close();
  });

  it('kit page and tub dialog: tubs and the audit columns are stacked, named, on screen', async () => {
    const page = await sessions.page(TEACHER, PHONE.width, PHONE.height);
    await page.goto(`${baseUrl()}/kits`);
    await page.getByRole('link', { name: 'Rover Builder Tub' }).first().click();
    await page.getByRole('heading', { name: 'Tubs' }).waitFor();
    await page.waitForLoadState('networkidle');

    // The tubs table: controller, status and missing parts of every tub.
    const tubs = await cells(page, 'table.tubs');
    assert.ok(tubs.filter((c) => c.label === 'Status').length >= 8, 'every demo tub is listed');
    assert.deepEqual(problems(tubs, PHONE.width), []);
    assert.deepEqual(await overflowing(page, 'app-kit-detail .table-wrap:has(table.tubs)'), []);
    // Its buttons stay on screen too.
    const buttons = await page.evaluate(
      () =>
        Array.from(document.querySelectorAll<HTMLElement>('table.tubs button'))
          .map((b) => b.getBoundingClientRect())
          .filter((r) => r.left < 0 || r.right > window.innerWidth).length,
    );
    assert.equal(buttons, 0, 'a tub button is drawn off screen');

    // The tub dialog: in tub, missing, and the two audit counts of every part.
    await page.getByRole('button', { name: 'Stock and audits of Tub 1' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('button', { name: 'Record audit' }).waitFor();
    const stock = await cells(page, 'mat-dialog-container table.stock');
    for (const label of ['In tub', 'Missing', 'Gone missing', 'Turned up'])
      assert.ok(stock.filter((c) => c.label === label).length > 5, `${label} for every part`);
    assert.deepEqual(problems(stock, PHONE.width), []);
    const fields = await page.evaluate(() =>
      Array.from(document.querySelectorAll<HTMLElement>('mat-dialog-container table.stock input'))
        .map((i) => ({ name: i.getAttribute('aria-label'), box: i.getBoundingClientRect() }))
        .filter(({ box }) => box.left < 0 || box.right > window.innerWidth)
        .map(({ name }) => name),
    );
    assert.deepEqual(fields, [], 'every count field is on screen');
    assert.deepEqual(await overflowing(page, 'mat-dialog-container .stock-wrap'), []);
    await page.context().close();
  });
});
