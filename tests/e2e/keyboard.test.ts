/**
 * Issue 15, by keyboard in Chromium: each action is pressed with Enter on its focused control and
 * `document.activeElement` is asserted afterwards, never <body>. W3C, WCAG 2.2
 * (https://www.w3.org/TR/WCAG22/): SC 2.4.3 Focus Order (focus goes into what opened, back to what
 * opened a closed thing, or stays on the control that started a finished action) and SC 4.1.3
 * Status Messages (the result is said without moving focus). tests/e2e/accessibility.test.ts
 * covers adding and deleting an activity and the invalid audit count. One browser; each role signs
 * in once; the lesson edited is a copy of the demo unit, deleted afterwards.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import type { Browser, Locator, Page } from 'playwright-core';
import { baseUrl, launch } from '../support/browser.js';
import { copyDemoUnit, deleteUnitCopy, demoLesson, Sessions } from '../support/sessions.js';

let browser: Browser;
let sessions: Sessions;
const TEACHER = 'teacher@kestrel-ridge.example';
const RELIEF = 'relief@kestrel-ridge.example';

/** The copied unit and its copy of the demo lesson, found once through the API. */
const at = { copyUnit: '', copyLesson: '' };

before(async () => {
  browser = await launch();
  sessions = new Sessions(browser);
  const demo = await demoLesson(sessions, TEACHER);
  // Dated before the demo term, so the teacher's current week stays as the demo left it.
  const copy = await copyDemoUnit(
    sessions,
    TEACHER,
    demo.unitId,
    'Rescue Rovers for the keyboard',
    '2026-01-05',
  );
  at.copyUnit = copy.unitId;
  at.copyLesson = copy.lessons.find((l) => l.title.startsWith('Drive straight'))!.id;
});
after(async () => {
  // The copy goes again, so later test files find the demo school as it was.
  if (at.copyUnit) await deleteUnitCopy(sessions, TEACHER, at.copyUnit);
  await browser.close();
});

async function open(email: string, path: string): Promise<Page> {
  const page = await sessions.page(email, 1280, 900);
  await page.goto(`${baseUrl()}${path}`);
  await page.getByRole('main').getByRole('heading', { level: 1 }).first().waitFor();
  await page.waitForLoadState('networkidle');
  return page;
}

/** Focuses a control and presses Enter, as a keyboard user does. */
async function press(page: Page, control: Locator): Promise<void> {
  await control.focus();
  await page.keyboard.press('Enter');
}

/**
 * Waits up to 5 s for focus to land on `selector`; answers 'as expected', or what has focus
 * instead (`body` when focus fell to the page).
 */
async function focusOn(page: Page, selector: string): Promise<string> {
  await page
    .waitForFunction((s) => document.activeElement?.matches(s), selector, { timeout: 5000 })
    .catch(() => undefined);
  return page.evaluate((s) => {
    const el = document.activeElement;
    if (el?.matches(s)) return 'as expected';
    if (!el || el === document.body) return 'body: focus fell to the page';
    const name = el?.getAttribute('aria-label') ?? el?.textContent?.trim().slice(0, 40);
    return `${el.tagName.toLowerCase()}.${el.className} "${name}"`;
  }, selector);
}

/** What the CDK's live announcer last put in its polite region (SC 4.1.3). */
function announced(page: Page): Promise<string> {
  return page
    .locator('.cdk-live-announcer-element')
    .first()
    .textContent()
    .then((t) => (t ?? '').trim());
}

describe('SC 2.4.3 Focus Order by keyboard: lesson editor', () => {
  it('Save lesson keeps focus on Save lesson once the save ends, and says it is saved', async () => {
    const page = await open(TEACHER, `/lessons/${at.copyLesson}/edit`);
    const title = page.getByLabel('Lesson title');
    const changed = `${await title.inputValue()} (checked)`;
    await title.fill(changed);
    await press(page, page.getByRole('button', { name: 'Save lesson' }));
    // The save ended: the snack bar says so (SC 4.1.3), and the button disabled while saving has
    // focus back rather than the page (SC 2.4.3).
    await page.getByText(`“${changed}” is saved.`).waitFor();
    assert.equal(await focusOn(page, 'button.save-lesson:not([disabled])'), 'as expected');
    await page.context().close();
  });

  it("an activity's Edit focuses its editor's title; Close returns focus to that Edit", async () => {
    const page = await open(TEACHER, `/lessons/${at.copyLesson}/edit`);
    const item = page.locator('[data-activity]').nth(1);
    const id = (await item.getAttribute('data-activity'))!;
    const name = (await item.locator('.activity-title').textContent())!.trim();
    await press(page, item.getByRole('button', { name: `Edit ${name}` }));
    // Into what opened: the Edit button is removed by @if, focus goes to the activity's title.
    assert.equal(
      await focusOn(
        page,
        `[data-activity="${id}"] app-activity-editor input[formcontrolname="title"]`,
      ),
      'as expected',
    );
    assert.equal(await page.locator(':focus').inputValue(), name);
    await press(page, item.getByRole('button', { name: 'Close', exact: true }));
    await item.locator('app-activity-editor').waitFor({ state: 'detached' });
    // Back to what opened the closed editor: the same activity's Edit button, rendered anew.
    assert.equal(
      await focusOn(page, `[data-activity="${id}"] button.edit-activity`),
      'as expected',
    );
    assert.equal(
      await page.evaluate(() => document.activeElement?.getAttribute('aria-label')),
      `Edit ${name}`,
    );
    await page.context().close();
  });

  it('"Move up" onto the first place moves focus to the same item\'s "Move down"', async () => {
    const page = await open(TEACHER, `/lessons/${at.copyLesson}/edit`);
    const items = page.locator('[data-activity]');
    const count = await items.count();
    assert.ok(count >= 2, `the copied lesson has ${count} activities`);
    const second = items.nth(1);
    const id = (await second.getAttribute('data-activity'))!;
    const name = (await second.locator('.activity-title').textContent())!.trim();
    await press(page, second.getByRole('button', { name: `Move ${name} up` }));
    // It is first now: its "Move up" is disabled, so focus goes to its "Move down" rather than
    // to the page (SC 2.4.3), and the new place is said (SC 4.1.3).
    await page
      .locator('[data-activity]')
      .first()
      .and(page.locator(`[data-activity="${id}"]`))
      .waitFor();
    assert.equal(await focusOn(page, `[data-activity="${id}"] button.move-down`), 'as expected');
    assert.ok(await page.locator(`[data-activity="${id}"] button.move-up`).isDisabled());
    await page.waitForFunction(
      () => !!document.querySelector('.cdk-live-announcer-element')?.textContent?.trim(),
    );
    assert.equal(await announced(page), `Moved to position 1 of ${count}.`);
    await page.context().close();
  });
});

describe('SC 2.4.3 Focus Order by keyboard: downloads and print', () => {
  for (const [label, file] of [
    ['Lesson pack', 'pack.pdf'],
    ['Tray labels', 'labels.pdf'],
  ] as const) {
    it(`lesson page: ${label} returns focus to its button once the file is made`, async () => {
      const page = await open(TEACHER, `/lessons/${at.copyLesson}`);
      const downloaded = page.waitForEvent('download');
      await press(page, page.getByRole('button', { name: label }));
      const download = await downloaded;
      assert.match(download.suggestedFilename(), /\.pdf$/);
      // The button was disabled while the file was made; focus returns to it (SC 2.4.3).
      assert.equal(
        await focusOn(page, `button[data-printable="${file}"]:not([disabled])`),
        'as expected',
      );
      await download.delete();
      await page.context().close();
    });
  }

  it('relief page: Print lesson pack returns focus to the pressed button', async () => {
    const page = await open(RELIEF, '/relief');
    const button = page.getByRole('button', { name: 'Print lesson pack' }).first();
    const id = (await button.getAttribute('data-print'))!;
    const downloaded = page.waitForEvent('download');
    await press(page, button);
    const download = await downloaded;
    assert.match(download.suggestedFilename(), /\.pdf$/);
    assert.equal(await focusOn(page, `button[data-print="${id}"]:not([disabled])`), 'as expected');
    await download.delete();
    await page.context().close();
  });
});

describe('SC 2.4.3 Focus Order by keyboard: tub dialog and Home', () => {
  it('tub dialog: a recorded audit shows and says so, focus back on Record audit', async () => {
    const page = await open(TEACHER, '/kits');
    await page.getByRole('link', { name: 'Rover Builder Tub' }).first().click();
    await page.getByRole('heading', { name: 'Parts list' }).waitFor();
    await press(page, page.getByRole('button', { name: 'Stock and audits of Tub 1' }));
    const dialog = page.getByRole('dialog');
    await dialog.waitFor();
    // A note only: the API has no way to delete an audit, and a note changes no stock count.
    await dialog.getByLabel('Note', { exact: true }).fill('Keyboard check of the audit form.');
    await press(page, dialog.getByRole('button', { name: 'Record audit' }));
    const message = 'The audit is recorded: the stock and history below are updated.';
    await dialog.getByText(message).waitFor();
    // The button disabled while sending has focus back (SC 2.4.3); the result is shown and said
    // without moving focus (SC 4.1.3).
    assert.equal(await focusOn(page, 'button.record-audit:not([disabled])'), 'as expected');
    await page.waitForFunction(
      (m) => document.querySelector('.cdk-live-announcer-element')?.textContent?.trim() === m,
      message,
    );
    await page.keyboard.press('Escape');
    await page.context().close();
  });

  it('Home: "Go … week of …" moves focus to the heading of the week it opened', async () => {
    const page = await open(TEACHER, '/');
    const link = page.getByRole('button', { name: /week with lessons \(week of / });
    // Home opens on a week with lessons when one is ahead: step back to an empty week.
    for (let i = 0; i < 30 && !(await link.isVisible()); i++) {
      await page.getByRole('button', { name: 'Previous week' }).click();
      await page.waitForLoadState('networkidle');
    }
    const text = (await link.textContent())!.trim();
    const week = /\(week of (.+)\)$/.exec(text)![1];
    await press(page, link);
    await link.waitFor({ state: 'detached' });
    // The link is gone once the week loads: focus goes to that week's heading (SC 2.4.3).
    assert.equal(await focusOn(page, 'h2.week-heading'), 'as expected');
    // The link names the week's Monday with its year ("Mon 14 Sep 2026"); the heading spans the
    // week ("Week of Mon 14 Sep – Sun 20 Sep 2026").
    const heading = await page.evaluate(() => document.activeElement?.textContent?.trim());
    const [monday, year] = [week.replace(/ \d{4}$/, ''), /\d{4}$/.exec(week)![0]];
    assert.ok(
      heading?.startsWith(`Week of ${monday}`) && heading.endsWith(year),
      `focus on "${heading}", not on the week of ${week}`,
    );
    await page.context().close();
  });
});
