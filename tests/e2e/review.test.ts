import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import type { Browser, BrowserContext, Page } from 'playwright-core';
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

async function signedIn(email: string): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signInThroughPage(page, email);
  return { context, page };
}

/** Picks an option of a Material select by its label. */
async function choose(page: Page, label: string, option: string | RegExp): Promise<void> {
  await page.getByRole('combobox', { name: label }).click();
  await page.getByRole('option', { name: option }).first().click();
}

/** The review panel's status line ("Status: In review"). */
async function statusOf(page: Page): Promise<string> {
  const panel = page.locator('app-review-panel');
  await panel.waitFor();
  const line = panel.locator('p', { hasText: 'Status:' }).first();
  return (await line.innerText()).replace(/\s+/g, ' ').trim();
}

describe('review through the screens', () => {
  it('teacher sends, lead asks for changes, teacher sends again, lead endorses, the matrix shows it', async () => {
    // A unit of its own per run (so reruns against one database never collide), Year 6 term 3,
    // listing the demo framework's outcome KRDT-6.2.
    const title = `Gate sensors ${Date.now().toString(36)}`;
    const teacher = await signedIn('teacher@kestrel-ridge.example');
    let page = teacher.page;
    await page.goto(`${baseUrl()}/units/new`);
    await page.getByLabel('Title').fill(title);
    await choose(page, 'Year level', 'Year 6');
    await choose(page, 'Term', 'Term 3');
    await page.getByRole('button', { name: 'Create unit' }).click();
    await page.waitForURL(/\/units\/[0-9a-f-]{36}$/);
    const unitId = new URL(page.url()).pathname.split('/').at(-1)!;
    await page.goto(`${baseUrl()}/units/${unitId}/edit`);
    await page.getByRole('heading', { name: 'Edit unit' }).waitFor();
    await page.getByPlaceholder('Search by code or words').fill('KRDT-6.2');
    await page
      .getByRole('option', { name: /KRDT-6\.2/ })
      .first()
      .click();
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByText('Your changes are saved.').waitFor();

    // 1. The teacher sends it for review with a message.
    await page.goto(`${baseUrl()}/units/${unitId}`);
    assert.equal(await statusOf(page), 'Status: Draft');
    await page.getByLabel('Comment or message').fill('Ready for a look.');
    await page.getByRole('button', { name: 'Send for review' }).click();
    await page.locator('app-review-panel').locator('p', { hasText: 'Status: In review' }).waitFor();

    // 2. The lead finds it in the queue and asks for a change.
    const lead = await signedIn('lead@kestrel-ridge.example');
    const leadPage = lead.page;
    await leadPage.goto(`${baseUrl()}/review`);
    const row = leadPage.getByRole('row', { name: new RegExp(title) });
    await row.waitFor();
    const cells = (await row.getByRole('cell').allInnerTexts()).map((c) => c.trim());
    assert.deepEqual(cells.slice(0, 4), [title, 'Year 6', 'Term 3', 'Sam Kowhai']);
    await leadPage.waitForLoadState('networkidle');
    assert.deepEqual(await axeFindings(leadPage), [], 'review queue');
    await row.getByRole('link', { name: title }).click();
    await leadPage.waitForURL(new RegExp(`/review/units/${unitId}$`));
    await leadPage.getByRole('heading', { level: 1, name: title }).waitFor();
    await leadPage.getByText('Ready for a look.').waitFor();
    await leadPage
      .getByText(/KRDT-6\.2/)
      .first()
      .waitFor();
    assert.deepEqual(await axeFindings(leadPage), [], 'review page of the unit');
    await leadPage.getByLabel('Comment or message').fill('Add a **pack-away** check.');
    await leadPage.getByRole('button', { name: 'Request changes' }).click();
    await leadPage
      .locator('app-review-panel')
      .locator('p', { hasText: 'Status: Changes requested' })
      .waitFor();

    // 3. The teacher reads the comment and sends it again.
    page = teacher.page;
    await page.reload();
    await page
      .locator('app-review-panel')
      .locator('p', { hasText: 'Status: Changes requested' })
      .waitFor();
    const asked = page.locator('app-comment-list li', { hasText: 'requested changes' });
    await asked.waitFor();
    // The Markdown is shown as bold text, not as asterisks.
    assert.equal(await asked.locator('strong', { hasText: 'pack-away' }).count(), 1);
    await page.getByLabel('Comment or message').fill('Added the pack-away check.');
    await page.getByRole('button', { name: 'Send for review' }).click();
    await page.locator('app-review-panel').locator('p', { hasText: 'Status: In review' }).waitFor();

    // 4. The lead endorses it.
    await leadPage.reload();
    await leadPage.getByText('Added the pack-away check.').waitFor();
    await leadPage.getByRole('button', { name: 'Endorse' }).click();
    await leadPage
      .locator('app-review-panel')
      .locator('p', { hasText: 'Status: Endorsed' })
      .waitFor();

    // 5. The matrix counts it among the endorsed units: Year 6, term 3, KRDT-6.2.
    await leadPage.goto(`${baseUrl()}/coverage`);
    await leadPage.getByRole('table').waitFor();
    await choose(leadPage, 'Year level', 'Year 6');
    await leadPage.getByRole('radio', { name: 'Endorsed only' }).click();
    const cell = leadPage.getByRole('button', { name: /^KRDT-6\.2, Year 6 term 3/ });
    await cell.waitFor();
    await cell.click();
    const picked = leadPage.getByRole('region', { name: /KRDT-6\.2 in Year 6, Term 3/ });
    await picked.getByRole('link', { name: title }).waitFor();
    await leadPage.waitForLoadState('networkidle');
    assert.deepEqual(await axeFindings(leadPage), [], 'coverage matrix');

    await teacher.context.close();
    await lead.context.close();
  });
});
