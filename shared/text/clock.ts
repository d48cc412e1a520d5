/**
 * One clock style for the app and the printables: the school's locale through Intl, never a
 * hand-written `h:mm a`. Values are wall-clock text the API already holds in the school's time
 * (`2026-07-28T11:10`, `2026-07-28T07:55:00+09:30`, a period's `09:50`), so the digits are read
 * from the text and formatted as a time of day; no conversion to the reader's own zone.
 */

/**
 * The locale school times are written in. One constant until schools choose their own: its
 * 12-hour clock with am/pm is how the demo school's timetables read (common practice, no
 * published source).
 */
export const SCHOOL_LOCALE = 'en-AU';

const formats = new Map<string, Intl.DateTimeFormat>();

function format(locale: string): Intl.DateTimeFormat {
  let f = formats.get(locale);
  if (!f) {
    // UTC in and UTC out: the wall-clock digits go through unchanged.
    f = new Intl.DateTimeFormat(locale, { hour: 'numeric', minute: '2-digit', timeZone: 'UTC' });
    formats.set(locale, f);
  }
  return f;
}

const TIME = /(?:^|T)(\d{2}):(\d{2})/;

/**
 * `11:10 am` for `2026-07-28T11:10`, `2026-07-28T11:10:00+09:30` or `11:10`, in the locale's
 * style. Text that holds no time comes back as it is.
 */
export function clockTime(value: string, locale = SCHOOL_LOCALE): string {
  const m = TIME.exec(value);
  if (!m) return value;
  const ms = Date.UTC(2000, 0, 1, Number(m[1]), Number(m[2]));
  // Newer ICU puts a narrow no-break space before am/pm; print fonts and tests want a space.
  return format(locale)
    .format(ms)
    .replace(/[\u202f\u00a0]/g, ' ');
}

/** `11:10 am–12:00 pm`: a span of two wall-clock values. */
export function clockSpan(from: string, to: string, locale = SCHOOL_LOCALE): string {
  return `${clockTime(from, locale)}–${clockTime(to, locale)}`;
}
