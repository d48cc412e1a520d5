/**
 * Text field builders that every schema uses, so no request can store a control character: a
 * single-line field (a title, a name, a label, a code) takes no line break at all, since it ends
 * up in file names, CSV cells, calendar properties and PDF headings; multi-line text (Markdown,
 * notes, descriptions) keeps tab, LF and CR but nothing else below U+0020 (a NUL byte cannot even
 * be stored in a PostgreSQL text column).
 */
import * as z from 'zod';

export const SINGLE_LINE_MESSAGE =
  'Use one line of text, without line breaks or control characters.';
export const CONTROL_CHARACTER_MESSAGE =
  'Remove the control characters (such as a NUL byte) from this text.';

/** C0 controls, DEL, C1 controls and the Unicode line and paragraph separators. */
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const NOT_ONE_LINE = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;
/** The same but tab, LF and CR, which multi-line text may hold. */
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;

type StringParams = Parameters<typeof z.string>[0];

/** A string of one line: no line break and no control character (checked before trimming). */
export function singleLine(params?: StringParams) {
  return z.string(params).refine((v) => !NOT_ONE_LINE.test(v), { error: SINGLE_LINE_MESSAGE });
}

/** A string that may span lines but holds no other control character. */
export function multiLine(params?: StringParams) {
  return z.string(params).refine((v) => !CONTROL.test(v), { error: CONTROL_CHARACTER_MESSAGE });
}

/** Whether a value is one line of text as singleLine() requires (for CSV cells and the like). */
export function isSingleLine(value: string): boolean {
  return !NOT_ONE_LINE.test(value);
}

/** The largest version a record can carry: PostgreSQL's integer (docs §8.1.1) ends here. */
export const VERSION_MAX = 2_147_483_647;

/** Years a school date may fall in (our choice: PostgreSQL has no year 0, and none is needed). */
export const YEAR_MIN = 1900;
export const YEAR_MAX = 2999;

/** A `YYYY-MM-DD` day that exists in the calendar, within YEAR_MIN…YEAR_MAX. */
export function schoolDate(message: string) {
  return z.string({ error: message }).refine(
    (s) => {
      const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(s);
      if (!m) return false;
      const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
      const t = new Date(Date.UTC(y, mo - 1, d));
      return (
        y >= YEAR_MIN &&
        y <= YEAR_MAX &&
        t.getUTCFullYear() === y &&
        t.getUTCMonth() === mo - 1 &&
        t.getUTCDate() === d
      );
    },
    { error: message },
  );
}
