import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFile } from 'node:fs/promises';
import type { Browser, Page } from 'playwright-core';
import { baseUrl, launch, seriousViolations, signInThroughPage } from '../support/browser.js';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

/** axe-core's serious and critical findings, worded so a failure says where. */
async function axeFindings(page: Page): Promise<string[]> {
  const violations = await seriousViolations(page);
  return violations.map(
    (v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`,
  );
}

describe('reusing a colleague’s unit through the screens', () => {
  it('the partner copies Rescue Rovers to 4M, sees where it came from, and prints the first lesson’s pack', async () => {
    const context = await browser.newContext({ acceptDownloads: true });
    const page = await context.newPage();
    await signInThroughPage(page, 'partner@kestrel-ridge.example');
    // A title of its own per run, so reruns against the same database never collide.
    const title = `Rescue Rovers for 4M ${Date.now().toString(36)}`;

    await page.goto(`${baseUrl()}/units`);
    await page.getByRole('tab', { name: 'School library' }).click();
    await page.getByRole('button', { name: 'Copy Rescue Rovers to my units', exact: true }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('heading', { name: 'Copy “Rescue Rovers” to my units' }).waitFor();
    // The form starts from the original's first lesson (Tuesday 21 July 2026 in the seed).
    assert.equal(await dialog.getByLabel('Date of the first lesson').inputValue(), '2026-07-21');
    await dialog.getByLabel('Title of the copy').fill(title);
    await dialog.getByRole('combobox', { name: 'Your class' }).click();
    await page.getByRole('option', { name: /^4M/ }).click();
    await dialog.getByLabel('Date of the first lesson').fill('2026-07-22');
    assert.deepEqual(await axeFindings(page), [], 'copy dialog');
    await dialog.getByRole('button', { name: 'Copy', exact: true }).click();

    // The recompute summary: 4M has 25 students, 4K 27 (BRIEF.md demo scenario).
    const summary = dialog.getByRole('status');
    await summary.waitFor();
    assert.match(
      await summary.innerText(),
      /^Plans for your class: \d+ groups (instead of \d+|as before)/,
    );
    await dialog.getByRole('button', { name: 'Open the copy' }).click();
    await page.waitForURL(/\/units\/[0-9a-f-]{36}$/);
    await page.getByRole('heading', { level: 1, name: title }).waitFor();

    // Its provenance, linking to the original, and its history.
    const provenance = page.locator('app-unit-provenance');
    await provenance.waitFor();
    assert.match(
      await provenance.innerText(),
      /Based on version \d+ of Rescue Rovers by Sam Kowhai, copied/,
    );
    await page.getByRole('link', { name: 'Rescue Rovers', exact: true }).waitFor();
    await page.getByRole('heading', { name: 'History' }).waitFor();
    await page.getByText(/copied from version \d+ of Rescue Rovers by Sam Kowhai/).waitFor();
    assert.deepEqual(await axeFindings(page), [], 'the copy’s page');

    // The first lesson, on 4M, moved to Wednesday 22 July; its pack prints.
    const first = page.locator('ol.lessons li').first();
    assert.match(await first.innerText(), /4M/);
    await first.getByRole('link').click();
    await page.waitForURL(/\/lessons\/[0-9a-f-]{36}$/);
    await page.getByRole('table').first().waitFor();
    const download = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Lesson pack' }).click();
    const file = await download;
    assert.match(file.suggestedFilename(), /^4M-.*\.pdf$/);
    // ISO 32000-1 §7.5.2: a PDF file begins with the header `%PDF-1.n`.
    const bytes = await readFile((await file.path())!);
    assert.match(bytes.subarray(0, 8).toString('latin1'), /^%PDF-1\.\d/);
    await context.close();
  });
});
