/**
 * Checks Trayplan's palette against WCAG 2.2: text contrast (SC 1.4.3, 4.5:1 for body text) and
 * non-text contrast of controls and focus indicators (SC 1.4.11, 3:1), and that the SCSS theme
 * really uses the palette's values.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import * as palette from '../../shared/theme/palette.js';

/**
 * One sRGB channel (0–255) linearised, as in WCAG 2.2's definition of relative luminance
 * (https://www.w3.org/TR/WCAG22/#dfn-relative-luminance). WCAG 2.2 gives the threshold as
 * 0.04045 (earlier versions printed 0.03928; no 8-bit value lies between the two).
 */
function linearChannel(value: number): number {
  const c = value / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

/** Relative luminance L = 0.2126 R + 0.7152 G + 0.0722 B (WCAG 2.2 definition). */
function relativeLuminance(hex: string): number {
  const match = /^#([0-9a-f]{6})$/i.exec(hex);
  if (!match) throw new Error(`Not a #RRGGBB colour: ${hex}`);
  const n = Number.parseInt(match[1], 16);
  const r = linearChannel((n >> 16) & 0xff);
  const g = linearChannel((n >> 8) & 0xff);
  const b = linearChannel(n & 0xff);
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** Contrast ratio (L1 + 0.05) / (L2 + 0.05), L1 the lighter (WCAG 2.2 definition). */
function contrastRatio(a: string, b: string): number {
  const [lighter, darker] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (lighter + 0.05) / (darker + 0.05);
}

test('the formula reproduces WCAG worked values', () => {
  // Source: WCAG 2.2 contrast ratio definition — ratios range from 1:1 to 21:1 (black on white).
  assert.equal(contrastRatio('#000000', '#FFFFFF'), 21);
  // Source: WCAG 2.2 Understanding SC 1.4.3 — #767676 on white is the lightest grey passing 4.5:1,
  // about 4.54:1.
  assert.ok(Math.abs(contrastRatio('#767676', '#FFFFFF') - 4.54) < 0.005);
  // One step lighter, #777777, falls just under 4.5:1 (about 4.48:1): #767676 is widely cited as
  // the lightest grey passing on white (from memory; it follows from the formula above).
  assert.ok(contrastRatio('#777777', '#FFFFFF') < 4.5);
  // Same colour on itself is 1:1 (WCAG 2.2 contrast ratio definition); order does not matter.
  assert.equal(contrastRatio('#2E5E4E', '#2E5E4E'), 1);
  assert.equal(contrastRatio('#FFFFFF', '#000000'), 21);
});

/** SC 1.4.3 Contrast (Minimum), level AA: text and images of text at least 4.5:1. */
const TEXT_MIN = 4.5;
/** SC 1.4.11 Non-text Contrast, level AA: UI component boundaries and states at least 3:1. */
const CONTROL_MIN = 3;

type Pair = readonly [name: string, foreground: string, background: string];

/** Every foreground/background pair the theme uses for text. */
const TEXT_PAIRS: readonly Pair[] = [
  ['body text on the page', palette.ON_SURFACE, palette.SURFACE],
  ['body text on cards and side nav', palette.ON_SURFACE, palette.SURFACE_CONTAINER],
  ['secondary text on the page', palette.ON_SURFACE_VARIANT, palette.SURFACE],
  ['secondary text on cards', palette.ON_SURFACE_VARIANT, palette.SURFACE_CONTAINER],
  ['toolbar and filled button text', palette.ON_PRIMARY, palette.PRIMARY],
  ['primary text buttons on the page', palette.PRIMARY, palette.SURFACE],
  ['primary text buttons on cards', palette.PRIMARY, palette.SURFACE_CONTAINER],
  ['text on primary container', palette.ON_PRIMARY_CONTAINER, palette.PRIMARY_CONTAINER],
  ['accent text on the page', palette.SECONDARY, palette.SURFACE],
  ['text on secondary colour', palette.ON_SECONDARY, palette.SECONDARY],
  ['selected navigation item', palette.ON_SECONDARY_CONTAINER, palette.SECONDARY_CONTAINER],
  ['error text under a field', palette.ERROR, palette.SURFACE],
  ['error text on cards', palette.ERROR, palette.SURFACE_CONTAINER],
  ['text on error colour', palette.ON_ERROR, palette.ERROR],
  ['error banner text', palette.ON_ERROR_CONTAINER, palette.ERROR_CONTAINER],
  ['snack-bar text', palette.INVERSE_ON_SURFACE, palette.INVERSE_SURFACE],
  ['snack-bar action', palette.INVERSE_PRIMARY, palette.INVERSE_SURFACE],
  ['links on the page', palette.LINK, palette.SURFACE],
  ['links on cards', palette.LINK, palette.SURFACE_CONTAINER],
];

/** Control boundaries and focus indicators against what surrounds them. */
const CONTROL_PAIRS: readonly Pair[] = [
  ['text field and outlined button border on the page', palette.OUTLINE, palette.SURFACE],
  ['control border on cards', palette.OUTLINE, palette.SURFACE_CONTAINER],
  ['control border on the selected nav item', palette.OUTLINE, palette.SECONDARY_CONTAINER],
  ['field border in error', palette.ERROR, palette.SURFACE],
  ['filled button against the page', palette.PRIMARY, palette.SURFACE],
  ['focus ring on the page', palette.FOCUS_RING, palette.SURFACE],
  ['focus ring on cards', palette.FOCUS_RING, palette.SURFACE_CONTAINER],
  // The toolbar draws its focus ring in ON_PRIMARY (see src/app/shell/shell.scss).
  ['focus ring on the toolbar', palette.ON_PRIMARY, palette.PRIMARY],
];

for (const [name, fg, bg] of TEXT_PAIRS) {
  test(`text contrast ≥ ${TEXT_MIN}:1 (SC 1.4.3): ${name}`, () => {
    const ratio = contrastRatio(fg, bg);
    assert.ok(ratio >= TEXT_MIN, `${fg} on ${bg} is ${ratio.toFixed(2)}:1`);
  });
}

for (const [name, fg, bg] of CONTROL_PAIRS) {
  test(`control contrast ≥ ${CONTROL_MIN}:1 (SC 1.4.11): ${name}`, () => {
    const ratio = contrastRatio(fg, bg);
    assert.ok(ratio >= CONTROL_MIN, `${fg} on ${bg} is ${ratio.toFixed(2)}:1`);
  });
}

test('every palette colour is covered by a contrast check', () => {
  const checked = new Set([...TEXT_PAIRS, ...CONTROL_PAIRS].flatMap(([, fg, bg]) => [fg, bg]));
  // OUTLINE_VARIANT is for decorative dividers only, which SC 1.4.11 does not cover.
  const exempt = new Set<string>([palette.OUTLINE_VARIANT]);
  const all = [...Object.values(palette.THEME_COLOURS), ...Object.values(palette.TRAYPLAN_COLOURS)];
  const unchecked = all.filter((hex) => !checked.has(hex) && !exempt.has(hex));
  assert.deepEqual(unchecked, []);
});

const scss = readFileSync(new URL('../../src/styles.scss', import.meta.url), 'utf8');

/** The body of the `$overrides: ( … )` map given to `mat.theme` in src/styles.scss. */
function overridesBlock(source: string): string {
  const start = source.indexOf('$overrides:');
  assert.ok(start >= 0, 'src/styles.scss passes $overrides to mat.theme');
  const open = source.indexOf('(', start);
  let depth = 0;
  for (let i = open; i < source.length; i++) {
    if (source[i] === '(') depth++;
    if (source[i] === ')' && --depth === 0) return source.slice(open + 1, i);
  }
  throw new Error('unbalanced $overrides map');
}

test('the SCSS theme sets every Material system colour to the palette value', () => {
  const block = overridesBlock(scss);
  for (const [name, hex] of Object.entries(palette.THEME_COLOURS)) {
    const entry = new RegExp(`(?<![\\w-])${name}:\\s*(#[0-9a-f]{6})\\b`, 'i').exec(block);
    assert.ok(entry, `$overrides sets ${name}`);
    assert.equal(entry[1].toUpperCase(), hex.toUpperCase(), `${name} in src/styles.scss`);
  }
});

test("the SCSS theme sets Trayplan's own custom properties to the palette value", () => {
  for (const [name, hex] of Object.entries(palette.TRAYPLAN_COLOURS)) {
    const entry = new RegExp(`--trayplan-${name}:\\s*(#[0-9a-f]{6})\\b`, 'i').exec(scss);
    assert.ok(entry, `src/styles.scss declares --trayplan-${name}`);
    assert.equal(entry[1].toUpperCase(), hex.toUpperCase(), `--trayplan-${name}`);
  }
});

test('the SCSS theme uses no colour literal outside the palette', () => {
  const allowed = new Set(
    [...Object.values(palette.THEME_COLOURS), ...Object.values(palette.TRAYPLAN_COLOURS)].map(
      (hex) => hex.toUpperCase(),
    ),
  );
  const literals = scss.match(/#[0-9a-f]{3,8}\b/gi) ?? [];
  const strays = literals.filter((hex) => !allowed.has(hex.toUpperCase()));
  assert.deepEqual(strays, []);
});
