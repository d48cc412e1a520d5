/** playwright-core on Debian's Chromium (never a downloaded browser), and axe-core checks. */
import { chromium, type Browser, type Page } from 'playwright-core';
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';

const require = createRequire(import.meta.url);

export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-dev-shm-usage',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-default-apps',
  '--disable-extensions',
  '--no-first-run',
  '--no-default-browser-check',
  '--disable-quic',
  '--mute-audio',
  '--host-resolver-rules=MAP * ~NOTFOUND , EXCLUDE 127.0.0.1',
];

export function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROME_BIN ?? '/usr/bin/chromium',
    args: CHROMIUM_ARGS,
    headless: true,
  });
}

/** The base URL of the app that tests/run.ts started as `npm start` starts it. */
export function baseUrl(): string {
  const url = process.env.TRAYPLAN_E2E_URL;
  if (!url)
    throw new Error('TRAYPLAN_E2E_URL is not set: run the end-to-end suite through npm test.');
  return url;
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** axe-core's tags for the success criteria of WCAG 2.0, 2.1 and 2.2 at levels A and AA. */
export const WCAG22_AA_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];

/**
 * Runs axe-core on the page; returns the serious and critical violations. With `tags`, only the
 * rules carrying one of them run (e.g. WCAG22_AA_TAGS).
 */
export async function seriousViolations(page: Page, tags?: string[]): Promise<AxeViolation[]> {
  // Evaluated through the DevTools protocol, so the page's strict CSP stays as it is.
  await page.evaluate(readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8'));
  const options = {
    resultTypes: ['violations'],
    ...(tags ? { runOnly: { type: 'tag', values: tags } } : {}),
  };
  const result = (await page.evaluate(async (opts) => {
    const axe = (
      window as unknown as { axe: { run: (ctx?: unknown, opts?: unknown) => Promise<unknown> } }
    ).axe;
    // axe tells an icon font's ligature ("chevron_left") from visible text only once the font
    // has loaded: run it on the page as the person sees it.
    await document.fonts.ready;
    return axe.run(document, opts);
  }, options)) as { violations: AxeViolation[] };
  return result.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

/** Signs in through the sign-in page and waits for the shell's navigation. */
export async function signInThroughPage(page: Page, email: string, password = 'trayplan-demo') {
  await page.goto(`${baseUrl()}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('navigation', { name: 'Main' }).waitFor();
}
