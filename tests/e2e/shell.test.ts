import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import type { Browser, ConsoleMessage } from 'playwright-core';
import { baseUrl, launch, seriousViolations, signInThroughPage } from '../support/browser.js';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

/** What each role sees in the navigation (the server enforces the same rules per route). */
const NAV: Record<string, string[]> = {
  'teacher@kestrel-ridge.example': ['Home', 'Units', 'Kits', 'Classes', 'Coverage'],
  'partner@kestrel-ridge.example': ['Home', 'Units', 'Kits', 'Classes', 'Coverage'],
  'lead@kestrel-ridge.example': ['Home', 'Units', 'Review', 'Outcomes', 'Coverage'],
  'relief@kestrel-ridge.example': ['Home', 'Relief'],
  'admin@kestrel-ridge.example': [
    'Home',
    'Review',
    'Kits',
    'Classes',
    'Outcomes',
    'Coverage',
    'School',
    'Members',
    'Mail outbox (development)',
  ],
};

describe('sign-in and the shell', () => {
  it('the sign-in page has no serious or critical axe-core violation and no CSP error', async () => {
    const page = await browser.newPage();
    const problems: string[] = [];
    page.on('console', (m: ConsoleMessage) => {
      if (m.type() === 'error') problems.push(m.text());
    });
    await page.goto(`${baseUrl()}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    const violations = await seriousViolations(page);
    assert.deepEqual(
      violations.map((v) => `${v.id}: ${v.help}`),
      [],
    );
    assert.deepEqual(
      problems.filter((p) => /Content Security Policy|Refused/.test(p)),
      [],
    );
    // Being signed out is normal: no failed request (a 401 of /api/auth/me) in the console.
    assert.deepEqual(
      problems.filter((p) => /401|Unauthorized|Failed to load resource/.test(p)),
      [],
    );
    // The product font ships with the app and is really used.
    const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    assert.match(family, /Source Sans 3/);
    await page.close();
  });

  it('a wrong password shows the message inline and stays on sign-in', async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl()}/sign-in`);
    await page.getByLabel('E-mail').fill('teacher@kestrel-ridge.example');
    await page.getByLabel('Password').fill('not the password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('alert').filter({ hasText: "don't match" }).waitFor();
    assert.match(page.url(), /\/sign-in/);
    await page.close();
  });

  for (const [email, expected] of Object.entries(NAV)) {
    it(`${email.split('@')[0]} signs in and sees only their own navigation`, async () => {
      const context = await browser.newContext();
      const page = await context.newPage();
      await signInThroughPage(page, email);
      const nav = page.getByRole('navigation', { name: 'Main' });
      // The mail outbox entry appears once the client learns the page exists: wait for the last
      // expected entry before reading them all.
      await nav.getByRole('link', { name: expected.at(-1)! }).waitFor();
      const labels = (await nav.getByRole('link').allInnerTexts()).map((s) =>
        s.replace(/^\S+\n/, '').trim(),
      );
      // Icons are ligature text inside the link: keep only the visible label words.
      const clean = labels.map((l) => l.split('\n').at(-1)!.trim());
      assert.deepEqual(clean, expected);
      assert.ok(await page.getByRole('banner').getByText('Trayplan').first().isVisible());
      await context.close();
    });
  }

  it('the shell has no serious or critical axe-core violation', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInThroughPage(page, 'admin@kestrel-ridge.example');
    const violations = await seriousViolations(page);
    assert.deepEqual(
      violations.map(
        (v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`,
      ),
      [],
    );
    await context.close();
  });

  it('a teacher who types the members address is sent home; the server refuses the API too', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInThroughPage(page, 'teacher@kestrel-ridge.example');
    await page.goto(`${baseUrl()}/members`);
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    assert.doesNotMatch(new URL(page.url()).pathname, /members/);
    const status = await page.evaluate(async () => (await fetch('/api/members')).status);
    assert.equal(status, 403);
    await context.close();
  });

  it('signing out returns to sign-in and the session is gone', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInThroughPage(page, 'relief@kestrel-ridge.example');
    // The user menu is the button with the signed-in person's name (demo data).
    await page
      .getByRole('banner')
      .getByRole('button', { name: /Robin Tally/ })
      .click();
    await page.getByRole('menuitem', { name: /sign out/i }).click();
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    const status = await page.evaluate(async () => (await fetch('/api/auth/me')).status);
    assert.equal(status, 401);
    await context.close();
  });
});
