import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
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

/** Opens a Material select by its label and picks an option. */
async function choose(page: Page, label: string, option: string | RegExp): Promise<void> {
  await page.getByRole('combobox', { name: label }).click();
  await page.getByRole('option', { name: option }).click();
}

describe('authoring a unit, a lesson and an activity through the screens', () => {
  it('the demo teacher creates them, reloads, finds them all, sees the prep plan and downloads the pack', async () => {
    const context = await browser.newContext({ acceptDownloads: true });
    const page = await context.newPage();
    await signInThroughPage(page, 'teacher@kestrel-ridge.example');
    // A name of its own per run, so reruns against the same database never collide.
    const stamp = Date.now().toString(36);
    const unitTitle = `Bridge Builders ${stamp}`;

    await page.goto(`${baseUrl()}/units`);
    await page.getByRole('heading', { level: 1 }).waitFor();
    await page.getByRole('table').first().waitFor();
    assert.deepEqual(await axeFindings(page), [], 'unit list');

    await page.goto(`${baseUrl()}/units/new`);
    await page.getByLabel('Title').fill(unitTitle);
    await choose(page, 'Year level', 'Year 4');
    await page.getByRole('button', { name: 'Create unit' }).click();
    await page.waitForURL(/\/units\/[0-9a-f-]{36}$/);
    const unitId = new URL(page.url()).pathname.split('/').at(-1)!;
    await page.getByRole('heading', { name: unitTitle }).waitFor();

    await page.goto(`${baseUrl()}/lessons/new?unit=${unitId}`);
    await page.getByRole('heading', { name: 'New lesson' }).waitFor();
    await page.getByLabel('Lesson title').fill('Test the deck');
    await choose(page, 'Class', /^4K/);
    await choose(page, 'Kit type', 'Rover Builder Tub');
    // Tubs of the kit type are booked by default once it is chosen.
    await page.getByRole('group', { name: 'Tubs booked' }).getByRole('checkbox').first().waitFor();
    await page.getByLabel('Date').fill('2026-08-11');
    await page.getByLabel('Starts').fill('11:10');
    await page.getByLabel('Ends').fill('12:00');
    assert.deepEqual(await axeFindings(page), [], 'lesson editor');
    await page.getByRole('button', { name: 'Create lesson' }).click();
    await page.waitForURL(/\/lessons\/[0-9a-f-]{36}\/edit$/);
    const lessonId = new URL(page.url()).pathname.split('/').at(-2)!;

    await page.getByRole('button', { name: 'Add an activity' }).click();
    await page.getByLabel('Activity title').fill('Build the deck');
    await page.getByRole('button', { name: 'Add a kit part' }).click();
    await page.getByLabel('Part (code or name)').fill('Rover controller');
    await page
      .getByRole('option', { name: /Rover controller/ })
      .first()
      .click();
    await page.getByRole('button', { name: 'Add a consumable' }).click();
    await page.getByLabel('Consumable').fill('Masking tape');
    await page.getByRole('button', { name: 'Add activity' }).click();
    await page.getByRole('button', { name: 'Save activity' }).waitFor();

    await page.reload();
    await page.getByRole('heading', { name: 'Edit lesson' }).waitFor();
    assert.equal(await page.getByLabel('Lesson title').inputValue(), 'Test the deck');
    assert.match((await page.getByRole('combobox', { name: 'Class' }).innerText()).trim(), /^4K/);
    assert.equal(await page.getByLabel('Starts').inputValue(), '11:10');
    await page.getByRole('button', { name: 'Edit Build the deck' }).click();
    assert.match(await page.getByLabel('Part (code or name)').inputValue(), /Rover controller/);
    assert.equal(await page.getByLabel('Consumable').inputValue(), 'Masking tape');
    // One per group: the defaults of a new part line, read back from the server.
    assert.equal(await page.getByLabel('Quantity').first().inputValue(), '1');
    assert.match(
      await page.getByRole('combobox', { name: 'For each' }).first().innerText(),
      /per group/,
    );
    assert.deepEqual(await axeFindings(page), [], 'lesson editor with an activity');

    await page.goto(`${baseUrl()}/units/${unitId}`);
    await page.getByRole('link', { name: 'Test the deck' }).waitFor();

    await page.goto(`${baseUrl()}/lessons/${lessonId}`);
    await page.getByRole('heading', { name: 'Test the deck' }).waitFor();
    await page.getByRole('table').first().waitFor();
    assert.ok((await page.getByRole('table').count()) > 0, 'a pull-list table');
    await page
      .getByRole('cell', { name: /Rover controller/ })
      .first()
      .waitFor();
    assert.deepEqual(await axeFindings(page), [], 'lesson view');

    const download = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Lesson pack' }).click();
    const file = (await download).suggestedFilename();
    assert.match(file, /^4K-.*\.pdf$/);
    await context.close();
  });
});
