/**
 * The one plural helper and the one clock style of app and printables. Clock times are checked
 * against CLDR's en-AU time format (h:mm a with lower-case "am"/"pm", as Intl in Node and
 * Chromium render it) and against en-GB's 24-hour HH:mm, to show the locale decides.
 */
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { listWords, noun, plural } from '../../shared/text/plural.js';
import { clockSpan, clockTime, SCHOOL_LOCALE } from '../../shared/text/clock.js';

describe('plural', () => {
  it('says 1 piece, 2 pieces, 0 tubs, and takes an irregular plural', () => {
    assert.equal(plural(1, 'piece'), '1 piece');
    assert.equal(plural(2, 'piece'), '2 pieces');
    assert.equal(plural(0, 'tub'), '0 tubs');
    assert.equal(plural(1, 'lesson'), '1 lesson');
    assert.equal(plural(3, 'battery', 'batteries'), '3 batteries');
    assert.equal(noun(1, 'tub'), 'tub');
    assert.equal(noun(4, 'tub'), 'tubs');
  });

  it('lists words with commas and a final "and"', () => {
    assert.equal(listWords([]), '');
    assert.equal(listWords(['Tub 1']), 'Tub 1');
    assert.equal(listWords(['Tub 1', 'Tub 3']), 'Tub 1 and Tub 3');
    assert.equal(listWords(['A', 'B', 'C']), 'A, B and C');
  });
});

describe('clockTime (Intl, the school locale)', () => {
  it('reads the wall-clock digits of local, offset and bare times alike', () => {
    assert.equal(SCHOOL_LOCALE, 'en-AU');
    assert.equal(clockTime('2026-07-28T11:10'), '11:10 am');
    assert.equal(clockTime('2026-07-28T07:55:00+09:30'), '7:55 am');
    assert.equal(clockTime('13:05'), '1:05 pm');
    // CLDR: 12 noon is 12 pm, midnight is 12 am (the 12-hour clock has no 0).
    assert.equal(clockTime('2026-07-28T12:00'), '12:00 pm');
    assert.equal(clockTime('2026-07-28T00:05'), '12:05 am');
    assert.equal(clockSpan('09:00', '09:50'), '9:00 am–9:50 am');
  });

  it('follows the locale: en-GB writes the 24-hour clock', () => {
    assert.equal(clockTime('13:05', 'en-GB'), '13:05');
  });

  it('gives back text that holds no time', () => {
    assert.equal(clockTime('soon'), 'soon');
  });
});
